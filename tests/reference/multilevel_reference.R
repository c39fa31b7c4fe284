# Reference values for poolMultilevel() and robustPool(): metafor's rma.mv (REML, random = ~ 1 | cluster/effect)
# and clubSandwich's CR2 coef_test / conf_int (Satterthwaite). Debian: r-cran-metafor, r-cran-clubsandwich.
#   Rscript multilevel_reference.R export        -> JSON with metafor's bundled data sets
#   Rscript multilevel_reference.R fit <dir>     -> JSON with the fits of every case listed in <dir>/cases.csv
# JSON is written by hand (base R only), numbers with 17 significant digits.
suppressPackageStartupMessages({
  library(metafor)
  library(clubSandwich)
})

num <- function(x) ifelse(is.finite(x), sprintf("%.17g", x), "null")
arr <- function(x) paste0("[", paste(num(x), collapse = ","), "]")
str_arr <- function(x) paste0("[", paste0('"', x, '"', collapse = ","), "]")
obj <- function(...) {
  fields <- list(...)
  paste0("{", paste(sprintf('"%s":%s', names(fields), unlist(fields)), collapse = ","), "}")
}

args <- commandArgs(trailingOnly = TRUE)

if (args[1] == "export") {
  k11 <- dat.konstantopoulos2011
  a16 <- dat.assink2016
  cat(obj(
    konstantopoulos2011 = obj(
      effects = arr(k11$yi), variances = arr(k11$vi), cluster = arr(k11$district),
      moderators = paste0("[", arr(k11$year), "]"), moderator_names = str_arr("year")
    ),
    assink2016 = obj(
      effects = arr(a16$yi), variances = arr(a16$vi), cluster = arr(a16$study),
      moderators = paste0("[", arr(a16$year), ",", arr(as.numeric(a16$deltype == "overt")), ",",
                          arr(as.numeric(a16$deltype == "covert")), "]"),
      moderator_names = str_arr(c("year", "deltype overt", "deltype covert"))
    )
  ))
  quit(status = 0)
}

# polish(): takes metafor's σ² to the exact REML optimum (multilevel_polish.R, beside this script)
here <- dirname(sub("^--file=", "", grep("^--file=", commandArgs(trailingOnly = FALSE), value = TRUE)[1]))
source(file.path(here, "multilevel_polish.R"))

fit_case <- function(dat, test, level) {
  dat$cluster <- factor(dat$cluster, levels = unique(dat$cluster))
  dat$effect <- seq_len(nrow(dat))
  mods <- grep("^m[0-9]+$", names(dat), value = TRUE)
  form <- if (length(mods)) as.formula(paste("~", paste(mods, collapse = " + "))) else ~ 1
  run <- function(...) rma.mv(yi, vi, mods = form, random = ~ 1 | cluster / effect, data = dat,
                              method = "REML", test = test, level = 100 * level, ...)
  free <- run()
  sigma2 <- polish(dat$yi, dat$vi, model.matrix(free), dat$cluster, free$sigma2)
  fit <- run(sigma2 = sigma2)
  if (as.numeric(logLik(fit)) < as.numeric(logLik(free)) - 1e-10) stop(sprintf("the polished fit lowered logLik: %.17g < %.17g (%s -> %s)", logLik(fit), logLik(free), paste(free$sigma2, collapse=" "), paste(sigma2, collapse=" ")))
  p <- length(fit$b)
  pred <- if (p > 1) predict(fit, newmods = matrix(0, nrow = 1, ncol = p - 1)) else predict(fit)
  w <- 1 / dat$vi
  k <- nrow(dat)
  typical_v <- (k - 1) * sum(w) / (sum(w)^2 - sum(w^2))
  total <- sum(fit$sigma2) + typical_v
  vc <- vcovCR(fit, cluster = dat$cluster, type = "CR2")
  ct <- coef_test(fit, vcov = vc, test = "Satterthwaite")
  ci <- conf_int(fit, vcov = vc, level = level, test = "Satterthwaite")
  obj(
    k = num(fit$k), clusters = num(nlevels(dat$cluster)),
    sigma2 = arr(fit$sigma2), sigma2_free = arr(free$sigma2), loglik_free = num(as.numeric(logLik(free))),
    b = arr(as.vector(fit$b)), se = arr(fit$se), zval = arr(fit$zval),
    pval = arr(fit$pval), ci_lb = arr(fit$ci.lb), ci_ub = arr(fit$ci.ub),
    ddf = if (test == "t") num(fit$ddf[1]) else "null",
    QE = num(fit$QE), QE_df = num(k - p), QEp = num(fit$QEp),
    I2_between = num(100 * fit$sigma2[1] / total), I2_within = num(100 * fit$sigma2[2] / total),
    pi_lb = num(pred$pi.lb), pi_ub = num(pred$pi.ub), loglik = num(as.numeric(logLik(fit))),
    robust = obj(beta = arr(ct$beta), se = arr(ct$SE), t = arr(ct$tstat), df = arr(ct$df_Satt),
                 p = arr(ct$p_Satt), ci_lb = arr(ci$CI_L), ci_ub = arr(ci$CI_U))
  )
}

if (args[1] == "fit") {
  dir <- args[2]
  cases <- read.csv(file.path(dir, "cases.csv"), stringsAsFactors = FALSE)
  out <- character(0)
  for (i in seq_len(nrow(cases))) {
    dat <- read.csv(file.path(dir, paste0(cases$id[i], ".csv")), stringsAsFactors = FALSE,
                    colClasses = c(cluster = "character"))
    out[i] <- sprintf('"%s":%s', cases$id[i], fit_case(dat, cases$test[i], cases$level[i]))
  }
  cat(paste0("{", paste(out, collapse = ","), "}"))
  quit(status = 0)
}

stop("usage: multilevel_reference.R export | fit <dir>")
