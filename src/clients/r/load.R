# Loads the Partwise R client without an install step: source("src/clients/r/load.R") from the repository root
# (or any path to this file). Needs Debian's r-cran-httr and r-cran-jsonlite.
local({
  here <- tryCatch(dirname(normalizePath(sys.frame(1)$ofile)), error = function(e) NULL)
  if (is.null(here) || !dir.exists(file.path(here, "R"))) here <- file.path("src", "clients", "r")
  suppressPackageStartupMessages({ library(httr); library(jsonlite) })
  files <- c("errors.R", "retry.R", "tables.R", "client.R", "compute.R", "baselines.R")
  for (f in files) sys.source(file.path(here, "R", f), envir = globalenv())
})
