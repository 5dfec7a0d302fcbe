# Exports two real clinical cohorts from Debian's r-cran-survival to CSV,
# with a binary outcome at a fixed horizon, an audit group column and the
# probability of a logistic regression fitted on a random half.
# Run once from this folder:  Rscript export.R
# (see README.md for the package version, citations and licence).
library(survival)
data(pbc, package = "survival")
data(cancer, package = "survival") # provides rotterdam

# Fits glm(formula) on a random half of d (seeded) and returns the fitted
# probability of every row and the 0/1 fitting-half indicator.
score_half <- function(d, formula, seed) {
  set.seed(seed)
  fit_rows <- sample(nrow(d), floor(nrow(d) / 2))
  fit <- glm(formula, family = binomial, data = d[fit_rows, ])
  print(summary(fit)$coefficients)
  list(score = round(unname(predict(fit, newdata = d, type = "response")), 6),
       in_fit = as.integer(seq_len(nrow(d)) %in% fit_rows))
}

# Mayo primary biliary cholangitis cohort (418 patients): death or liver
# transplant within 4 years of registration; rows censored alive before 4
# years are left out (their outcome at the horizon is unknown).
horizon_pbc <- 4 * 365.25
p <- pbc
p$event4 <- as.integer(p$status > 0 & p$time <= horizon_pbc)
p <- p[p$event4 == 1 | p$time > horizon_pbc, ]
p <- p[!is.na(p$protime), ] # two rows without a clotting time: the model cannot score them
s <- score_half(p, event4 ~ age + log(bili) + log(albumin) + log(protime) + edema, seed = 20240901)
pbc_out <- data.frame(id = p$id, sex = p$sex, age = round(p$age, 2), bili = p$bili,
                      albumin = p$albumin, protime = p$protime, edema = p$edema,
                      event4 = p$event4, score = s$score, in_fit = s$in_fit)
dir.create("pbc", showWarnings = FALSE)
write.csv(pbc_out, "pbc/pbc.csv", row.names = FALSE, quote = FALSE)

# Rotterdam tumour bank (2,982 primary breast cancers): death within 5
# years of surgery; rows censored alive before 5 years are left out.
horizon_rot <- 5 * 365.25
r <- rotterdam
r$death5 <- as.integer(r$death == 1 & r$dtime <= horizon_rot)
r <- r[r$death5 == 1 | r$dtime > horizon_rot, ]
s <- score_half(r, death5 ~ age + size + grade + log1p(nodes) + log1p(pgr) + log1p(er) + hormon + chemo,
                seed = 20240902)
size_code <- c("<=20" = "le20", "20-50" = "20to50", ">50" = "gt50")
rot_out <- data.frame(pid = r$pid, menopause = ifelse(r$meno == 1, "post", "pre"), age = r$age,
                      size = unname(size_code[as.character(r$size)]), grade = r$grade,
                      nodes = r$nodes, pgr = r$pgr, er = r$er, hormon = r$hormon, chemo = r$chemo,
                      death5 = r$death5, score = s$score, in_fit = s$in_fit)
dir.create("rotterdam", showWarnings = FALSE)
write.csv(rot_out, "rotterdam/rotterdam.csv", row.names = FALSE, quote = FALSE)

cat("pbc rows", nrow(pbc_out), "events", sum(pbc_out$event4), "\n")
print(table(pbc_out$sex, pbc_out$event4))
cat("rotterdam rows", nrow(rot_out), "events", sum(rot_out$death5), "\n")
print(table(rot_out$menopause, rot_out$death5))
