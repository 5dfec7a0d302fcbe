package main

import (
	"fmt"
	"time"

	"github.com/spf13/cobra"

	"github.com/gapwise/gapwise/fairness"
)

// flagAuditDate names the flag that dates an audit.
const flagAuditDate = "audit-date"

// bindAuditDateFlag adds --audit-date to cmd, stored in dst.
func bindAuditDateFlag(cmd *cobra.Command, dst *string) {
	cmd.Flags().StringVar(dst, flagAuditDate, "",
		"date the audit `YYYY-MM-DD` (or today) in the reports and result.json, replacing the spec's audit_date; without it and the key the output holds no date")
}

// auditDate checks --audit-date and returns the date it stands for: ""
// when not given, today's local date for "today", the value itself when
// it is an ISO 8601 calendar date (fairness.CheckAuditDate).
func auditDate(flag string) (string, error) {
	switch flag {
	case "":
		return "", nil
	case "today":
		return time.Now().Format(fairness.AuditDateLayout), nil
	}
	if err := fairness.CheckAuditDate(flag); err != nil {
		return "", &usageError{fmt.Sprintf("--%s %v", flagAuditDate, err)}
	}
	return flag, nil
}
