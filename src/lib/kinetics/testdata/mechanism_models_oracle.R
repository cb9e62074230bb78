# R as an outside oracle for the extended mechanism models (mechanism-models.ts): each data set
# is fitted with minpack.lm::nlsLM (Levenberg-Marquardt, Elzhov et al., CRAN minpack.lm) in the
# textbook parameterisation (Kic, Kiu, Ksi, beta, Morrison's K'), independent of the engine's
# reciprocal constants; base R's nls (Gauss-Newton) then polishes from that solution.
#
# fit_blocks(lines) reads blocks of
#   #<id>|<model>|<enzyme conc or 0>|<name>=<start>;<name>=<start>...
#   s,i,y          (one row per observation)
# and prints "<id>,<name>,<estimate>,<standard error>" for every coefficient and "<id>,rss,<RSS>,0".
# Models named "lof-<model>" (a standard one) also print the lack-of-fit test against the one-way
# model of the (s, i) cells, as anova() of nested fits computes it: "<id>,lofF,<F>,0",
# "<id>,lofP,<p>,0", "<id>,lofDf,<df lack of fit>,<df pure error>".
# Used by mechanism-models.test.ts through testdata/r-oracle.ts (runR).
suppressMessages(library(minpack.lm))

formulas <- list(
  "substrate-inhibition-competitive" = y ~ V * s / (Km * (1 + i / Kic) + s + s^2 / Ksi),
  "substrate-inhibition-uncompetitive" = y ~ V * s / (Km + s * (1 + i / Kiu) + s^2 / Ksi),
  "substrate-inhibition-noncompetitive" = y ~ V * s / ((Km + s) * (1 + i / Ki) + s^2 / Ksi),
  "substrate-inhibition-mixed" = y ~ V * s / (Km * (1 + i / Kic) + s * (1 + i / Kiu) + s^2 / Ksi),
  "partial-competitive" = y ~ V * s * (1 + i / Kiu) / (Km * (1 + i / Kic) + s * (1 + i / Kiu)),
  "partial-uncompetitive" = y ~ V * s * (1 + beta * i / Kiu) / (Km + s * (1 + i / Kiu)),
  "partial-noncompetitive" = y ~ V * s * (1 + beta * i / Ki) / ((Km + s) * (1 + i / Ki)),
  "partial-mixed" = y ~ V * s * (1 + beta * i / Kiu) / (Km * (1 + i / Kic) + s * (1 + i / Kiu)),
  "lof-competitive" = y ~ V * s / (Km * (1 + i / Kic) + s),
  "lof-mixed" = y ~ V * s / (Km * (1 + i / Kic) + s * (1 + i / Kiu)),
  # Morrison quadratic with K' of each mechanism (Cheng-Prusoff forms)
  "tight-binding-competitive" = y ~ V * s / (Km + s) *
    (1 - ((E + i + Kic * (1 + s / Km)) - sqrt((E + i + Kic * (1 + s / Km))^2 - 4 * E * i)) / (2 * E)),
  "tight-binding-uncompetitive" = y ~ V * s / (Km + s) *
    (1 - ((E + i + Kiu * (1 + Km / s)) - sqrt((E + i + Kiu * (1 + Km / s))^2 - 4 * E * i)) / (2 * E)),
  "tight-binding-noncompetitive" = y ~ V * s / (Km + s) *
    (1 - ((E + i + Ki) - sqrt((E + i + Ki)^2 - 4 * E * i)) / (2 * E)),
  "tight-binding-mixed" = y ~ V * s / (Km + s) *
    (1 - ((E + i + (s + Km) / (s / Kiu + Km / Kic)) -
      sqrt((E + i + (s + Km) / (s / Kiu + Km / Kic))^2 - 4 * E * i)) / (2 * E))
)

fit_blocks <- function(lines) {
  heads <- which(startsWith(lines, "#"))
  ends <- c(heads[-1] - 1, length(lines))
  for (k in seq_along(heads)) {
    head <- strsplit(substring(lines[heads[k]], 2), "|", fixed = TRUE)[[1]]
    id <- head[1]
    model <- head[2]
    E <- as.numeric(head[3])
    pairs <- strsplit(strsplit(head[4], ";", fixed = TRUE)[[1]], "=", fixed = TRUE)
    start <- setNames(lapply(pairs, function(p) as.numeric(p[2])), sapply(pairs, function(p) p[1]))
    rows <- lines[(heads[k] + 1):ends[k]]
    df <- read.csv(text = paste(c("s,i,y", rows), collapse = "\n"))
    df$E <- E
    ctl <- nls.lm.control(maxiter = 1000, ftol = 1e-14, ptol = 1e-14)
    fit <- nlsLM(formulas[[model]], data = df, start = start, control = ctl)
    polished <- tryCatch(nls(formulas[[model]], data = df, start = as.list(coef(fit))), error = function(e) fit)
    co <- summary(polished)$coefficients
    for (name in rownames(co)) cat(sprintf("%s,%s,%.12g,%.12g\n", id, name, co[name, 1], co[name, 2]))
    cat(sprintf("%s,rss,%.12g,0\n", id, deviance(polished)))
    if (startsWith(model, "lof-")) {
      cells <- lm(y ~ factor(paste(s, i)), data = df)
      dfLof <- df.residual(polished) - df.residual(cells)
      dfPe <- df.residual(cells)
      f <- ((deviance(polished) - deviance(cells)) / dfLof) / (deviance(cells) / dfPe)
      cat(sprintf("%s,lofF,%.12g,0\n%s,lofP,%.12g,0\n%s,lofDf,%d,%d\n", id, f, id,
        pf(f, dfLof, dfPe, lower.tail = FALSE), id, dfLof, dfPe))
    }
  }
}
