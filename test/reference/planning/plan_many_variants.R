# Classic two-proportion z-test size per variant at a significance level split over m challengers
# (Bonferroni), for the Plan section's tests (taskpane/logic/plan.ts). The values printed are pasted into
# plan_many_variants.json ("classic_n") by plan_many_variants.py.
# Run: Rscript test/reference/planning/plan_many_variants.R
for (m in c(1, 2, 4, 9)) {
  r <- power.prop.test(p1 = 0.10, p2 = 0.15, sig.level = 0.05 / m, power = 0.8)
  cat(m, sprintf("%.9f", r$n), "\n")
}
