# Sourced by multilevel_reference.R and the multilevel synthesis reference test.
# metafor's optimiser works on finite differences and stops ~1e-7 (relative) short of the REML optimum. Fisher
# scoring with the dense analytic gradient and information (Harville 1977) polishes its σ² to the optimum of the
# same restricted likelihood; metafor then refits with σ² fixed there (so every other field is metafor's own),
# and its logLik must not fall below the free fit's. With only singleton clusters only the sum is identified
# and the polish keeps metafor's even split.
polish <- function(yi, vi, X, cluster, sigma2) {
  k <- length(yi)
  singletons <- all(table(cluster) == 1)
  D <- if (singletons) list(diag(k)) else list(tcrossprod(model.matrix(~ cluster - 1)), diag(k))
  s2 <- if (singletons) sum(sigma2) else sigma2
  for (it in 1:500) {
    V <- diag(vi, k)
    for (r in seq_along(D)) V <- V + s2[r] * D[[r]]
    Vi <- chol2inv(chol(V))
    ViX <- Vi %*% X
    P <- Vi - ViX %*% solve(crossprod(X, ViX), t(ViX))
    Py <- P %*% yi
    PD <- lapply(D, function(m) P %*% m)
    g <- sapply(seq_along(D), function(r) 0.5 * (sum(Py * (D[[r]] %*% Py)) - sum(diag(PD[[r]]))))
    scale <- sapply(seq_along(D), function(r) 0.5 * (sum(Py * (D[[r]] %*% Py)) + sum(diag(PD[[r]]))))
    info <- outer(seq_along(D), seq_along(D), Vectorize(function(r, s) 0.5 * sum(PD[[r]] * t(PD[[s]]))))
    free <- s2 > 0 | g > 0
    if (all(abs(ifelse(free, g, 0)) <= 1e-13 * scale)) break
    step <- solve(info[free, free, drop = FALSE], g[free])
    s2[free] <- pmax(0, s2[free] + step)
  }
  if (singletons) rep(s2 / 2, 2) else s2
}

