module github.com/gapwise/gapwise

go 1.26.8

require (
	github.com/go-echarts/go-echarts/v2 v2.6.7
	github.com/spf13/cobra v1.10.2
	golang.org/x/sys v0.50.0
	golang.org/x/term v0.48.0
	gonum.org/v1/gonum v0.17.0
	gopkg.in/yaml.v3 v3.0.1
)

require (
	github.com/inconshreveable/mousetrap v1.1.0 // indirect
	github.com/kr/text v0.2.0 // indirect
	github.com/spf13/pflag v1.0.9 // indirect
	golang.org/x/tools v0.30.0 // indirect
)
