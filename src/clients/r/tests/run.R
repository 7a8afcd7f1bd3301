#!/usr/bin/env Rscript
# Tests of the R client against a running Partwise service (PARTWISE_URL, default http://127.0.0.1:5080).
#   Rscript src/clients/r/tests/run.R          (from the repository root; Debian's r-base-core, r-cran-httr, r-cran-jsonlite)
# Numbers are compared with base R computations of the published formulas: closure, clr, alr, centre, variation
# matrix and distance (Aitchison 1986), ilr = clr V (Egozcue et al. 2003), multiplicative replacement
# (Martin-Fernandez, Barcelo-Vidal & Pawlowsky-Glahn 2003), Mahalanobis distance (stats::mahalanobis), and
# "J-1 connected ratios explain all the log-ratio variance" (Greenacre 2019). Retries are checked against the
# scripted server of the Python client's tests (python3, 127.0.0.1:PARTWISE_FAKE_PORT, default 5369).
# Prints PASS/FAIL per test and a final "N passed, N failed"; exits 1 when any failed.

root <- normalizePath(file.path(dirname(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE)[1])), "..", "..", "..", ".."))
source(file.path(root, "src", "clients", "r", "load.R"))

passed <- 0L
failed <- 0L
test <- function(name, code) {
  result <- tryCatch({ force(code); NULL }, error = function(e) e)
  if (is.null(result)) {
    passed <<- passed + 1L
    cat("PASS ", name, "\n")
  } else {
    failed <<- failed + 1L
    cat("FAIL ", name, "\n  ", conditionMessage(result), "\n", sep = "")
  }
}
expect <- function(ok, what) if (!isTRUE(ok)) stop(what, call. = FALSE)
# |a - e| <= 1e-10 + 1e-9 max(|a|, |e|), the same rule as the Python client's tests
close_to <- function(expected, actual, what) {
  e <- as.numeric(unlist(expected)); a <- as.numeric(unlist(actual))
  expect(length(e) == length(a), paste0(what, ": ", length(a), " values, expected ", length(e)))
  expect(all(is.finite(a)), paste0(what, ": non-finite values"))
  bad <- abs(a - e) > 1e-10 + 1e-9 * pmax(abs(a), abs(e))
  if (any(bad)) { k <- which(bad)[1]; stop(sprintf("%s: at %d expected %.17g, got %.17g", what, k, e[k], a[k]), call. = FALSE) }
}
problem_of <- function(code) tryCatch({ force(code); NULL }, partwise_problem = function(p) p)

pw <- pw_client()
parts <- c("Ca", "Mg", "Na", "K", "HCO3", "Cl", "SO4", "NO3")
set.seed(20251202)
x <- matrix(exp(rnorm(30 * 8, log(10), 0.6)), 30, dimnames = list(sprintf("s%03d", 0:29), parts))
frame <- as.data.frame(x)
closure <- function(m, total = 1) total * m / rowSums(m)
clr <- function(m) { l <- log(m); l - rowMeans(l) }

test("tables: row names are ids, automatic row names send none, an id column is used", {
  t <- pw_table(frame)
  expect(identical(as.character(t$parts), parts) && identical(as.character(t$ids), rownames(x)), "parts and ids")
  expect(is.null(pw_table(data.frame(a = 1, b = 2))$ids), "no ids for automatic row names")
  expect(identical(as.character(pw_table(data.frame(id = "q", a = 1, b = 2))$ids), "q"), "id column")
  expect(identical(as.character(pw_table(data.frame(id = "q", a = 1, b = 2))$parts), c("a", "b")), "id column is no part")
  expect(identical(as.character(pw_json(pw_table(data.frame(a = 1, b = NA)))), '{"parts":["a","b"],"rows":[[1,null]]}'), "one row, NA as null")
})

test("clr coordinates equal base R", {
  got <- pw_coordinates(pw, frame, "clr")
  expect(identical(rownames(got), rownames(x)), "ids as row names")
  expect(identical(names(got), paste0("clr(", parts, ")")), "labels")
  close_to(clr(x), as.matrix(got), "clr")
})

test("alr coordinates equal base R", {
  got <- pw_coordinates(pw, frame, list(type = "alr", denominator = "Cl"))
  close_to(log(x[, -6] / x[, 6]), as.matrix(got), "alr on Cl")
})

test("ilr coordinates are clr times the returned orthonormal basis", {
  got <- pw_coordinates(pw, frame, "ilr")
  V <- attr(got, "basis")
  close_to(diag(7), crossprod(V), "V'V = I")
  close_to(clr(x) %*% V, as.matrix(got), "ilr = clr V")
})

test("the inverse of clr recovers the closed table", {
  back <- pw_inverse(pw, pw_coordinates(pw, frame, "clr"), parts, "clr", total = 100)
  expect(identical(rownames(back), rownames(x)), "ids kept")
  close_to(closure(x, 100), as.matrix(back), "inverse clr")
})

test("prepare replaces a zero multiplicatively and closes", {
  y <- x[1:3, ]; y[2, 8] <- 0
  got <- pw_prepare(pw, as.data.frame(y), zeros = list(method = "multiplicative", detectionLimits = c(NO3 = 0.05), fraction = 0.65))
  r <- y; r[2, ] <- y[2, ] * (1 - 0.65 * 0.05 / sum(y[2, ])); r[2, 8] <- 0.65 * 0.05
  close_to(closure(r), as.matrix(got), "prepared")
  imputed <- attr(got, "imputed")
  expect(imputed$row == 1 && imputed$part == "NO3", "imputed cell (0-based row)")
})

test("summary equals base R centre, variation matrix and clr covariance", {
  s <- pw_summary(pw, frame)
  n <- nrow(x); k <- if (s$divisor == "n-1") 1 else (n - 1) / n
  g <- exp(colMeans(log(x)))
  close_to(g / sum(g), s$center, "centre")
  l <- log(x)
  vm <- outer(1:8, 1:8, Vectorize(function(i, j) stats::var(l[, i] - l[, j]) * k))
  close_to(vm, s$variationMatrix, "variation matrix")
  close_to(stats::cov(clr(x)) * k, s$clrCovariance, "clr covariance")
  expect(identical(names(s$center), parts), "centre named by part")
})

test("distances are Euclidean distances of clr", {
  d <- pw_distances(pw, frame[1:10, ])
  close_to(as.matrix(stats::dist(clr(x[1:10, ]))), d, "distances")
  expect(identical(rownames(d), rownames(x)[1:10]), "ids")
})

test("selection from moments matches selection from the table; moments equal the cross-product formula", {
  a <- list(hardness = c("Ca", "Mg"))
  t <- pw_select_ratios(pw, frame, amalgamations = a, max_ratios = 4)
  m <- pw_log_moments(frame, a)
  logs <- cbind(log(x), log(x[, 1] + x[, 2]))
  centred <- sweep(logs, 2, colMeans(logs))
  close_to(crossprod(centred) / (nrow(x) - 1), m$covariance, "moments")
  s <- pw_select_ratios(pw, moments = m, amalgamations = a, max_ratios = 4)
  expect(identical(t$steps$label, s$steps$label) && nrow(t$steps) == 4, "same ratios")
  close_to(t$steps$explained, s$steps$explained, "explained")
})

test("a chain of J-1 ratios explains everything and reconstructs the table", {
  chain <- paste0(parts[-8], "/", parts[-1])
  e <- pw_evaluate_ratios(pw, frame, chain)
  close_to(1, e$explained, "explained")
  expect(e$rank == 7 && isTRUE(e$invertible), "rank and invertible")
  values <- log(x[, -8] / x[, -1])
  back <- pw_reconstruct(pw, values, parts, chain, total = 1)
  close_to(closure(x), as.matrix(back), "reconstructed")
})

test("lra inertia equals the SVD of centred clr", {
  l <- pw_lra(pw, frame, weights = "equal")
  z <- clr(x); s <- svd(sweep(z, 2, colMeans(z)))$d[1:7]
  close_to(s^2 / sum(s^2), l$inertia[1:7], "inertia")
  expect(startsWith(trimws(pw_lra(pw, frame, svg = TRUE)), "<"), "svg")
})

test("a zero under reject is a partwise_problem with the problem document", {
  p <- problem_of(pw_coordinates(pw, data.frame(Ca = 1, Mg = 0)))
  expect(inherits(p, "partwise_problem") && inherits(p, "error"), "class")
  expect(p$status == 422 && p$type == "/problems/zero-value" && identical(p$pointers, "/rows/0/1"), conditionMessage(p))
  expect(nzchar(p$title) && nzchar(p$detail) && !is.na(p$request_id) && p$problem$status == 422, "fields")
  q <- problem_of(pw_coordinates(pw, data.frame(Ca = c(1, NA), Mg = c(2, 3))))
  expect(q$status %/% 100 == 4 && "/rows/1/0" %in% q$pointers, "missing cell")
})

test("health and readiness", {
  expect(!is.null(pw_health(pw)$status) && !is.null(pw_ready(pw)$status), "status")
})

tag <- paste0("r-", paste(sample(c(letters, 0:9), 8, TRUE), collapse = ""))
far <- function(id, scale = 40) {
  v <- stats::setNames(as.list(rep(10, 8)), parts); v$Na <- 10 * scale; v$Cl <- 10 * scale
  list(id = id, values = v, observedAt = "2026-03-02T10:30:00Z", source = "r-client-test")
}
set.seed(11)
ref <- as.data.frame(matrix(exp(rnorm(60 * 8, log(10), 0.6)), 60, dimnames = list(sprintf("r%03d", 1:60), parts)))
doc <- pw_create_baseline(pw, ref, paste("r client test", tag), description = "invented test data", scatter = "classical",
                          rules = list(list(ratio = "Cl/HCO3", max = 5)))

test("a created baseline is listed and read back; its classical location is the mean ilr", {
  expect(doc$scatter == "classical" && identical(doc$parts, parts), "document")
  expect(doc$id %in% pw_baselines(pw)$id, "listed")
  close_to(doc$location, pw_baseline(pw, doc$id)$location, "read back")
  expect(pw_find_baseline(pw, doc$name)$id == doc$id, "found by name")
  close_to(colMeans(clr(as.matrix(ref)) %*% doc$basis), doc$location, "location")
})

test("screening distance equals stats::mahalanobis; a repeat is a duplicate; inline screens the same", {
  s <- far(paste0(tag, "/far"))
  first <- pw_screen(pw, doc$id, list(s))
  z <- clr(matrix(unlist(s$values), 1)) %*% doc$basis
  close_to(stats::mahalanobis(z, doc$location, doc$covariance), first$squaredDistance, "d^2")
  expect(isTRUE(first$flagged) && nzchar(first$flagId) && !first$duplicate, "flagged")
  expect(first$ruleViolations[[1]]$label == "Cl/HCO3", "rule violation")
  expect(all(lengths(first$reasons[[1]]$expected) == 2), "expected ranges")
  again <- pw_screen(pw, doc$id, list(s))
  expect(isTRUE(again$duplicate) && again$distance == first$distance, "duplicate")
  close_to(first$distance, pw_screen_inline(pw, pw_baseline(pw, doc$id), list(s))$distance, "inline")
})

test("the same id with other values is a 409", {
  id <- paste0(tag, "/conflict")
  pw_screen(pw, doc$id, list(far(id)))
  p <- problem_of(pw_screen(pw, doc$id, list(far(id, 41))))
  expect(!is.null(p) && p$status == 409, "409")
})

test("a data frame of samples screens in batches", {
  f <- ref[1:7, ]; rownames(f) <- paste0(tag, "/ref-", 1:7)
  r <- pw_screen(pw, doc$id, f, batch_size = 3, source = "r-client-test")
  expect(identical(r$sampleId, rownames(f)), "one result per sample in order")
})

test("flags: list, ETag and 304, long poll, review", {
  flagged <- pw_screen(pw, doc$id, list(far(paste0(tag, "/flag-1"))))
  page <- pw_flags(pw, baseline = doc$id, limit = 500)
  expect(flagged$flagId %in% page$items$id && nzchar(page$etag), "listed")
  same <- pw_flags(pw, baseline = doc$id, limit = 500, etag = page$etag)
  expect(isTRUE(same$not_modified) && nrow(same$items) == 0, "304")
  started <- Sys.time()
  waited <- pw_flags(pw, baseline = doc$id, limit = 500, etag = page$etag, wait_seconds = 1)
  expect(isTRUE(waited$not_modified) && as.numeric(difftime(Sys.time(), started, units = "secs")) >= 0.9, "long poll waited")
  reviewed <- pw_review_flag(pw, flagged$flagId, "dismissed", note = "r test", reviewer = "r-client-test")
  expect(reviewed$status == "dismissed" && reviewed$review$note == "r test", "reviewed")
  expect(flagged$flagId %in% pw_flags(pw, baseline = doc$id, status = "dismissed", limit = 500)$items$id, "listed as dismissed")
})

test("bad queries and unknown or retired baselines are problems", {
  p <- problem_of(pw_flags(pw, limit = 501))
  expect(p$status == 400 && identical(p$pointers, "/limit"), "limit")
  expect(problem_of(pw_baseline(pw, strrep("0", 32)))$status == 404, "404")
  gone <- pw_create_baseline(pw, ref, paste("r client test retired", tag), scatter = "classical")
  pw_retire_baseline(pw, gone$id)
  expect(!(gone$id %in% pw_baselines(pw, active = TRUE)$id), "not active")
  expect(problem_of(pw_screen(pw, gone$id, list(far(paste0(tag, "/retired")))))$status == 410, "410")
})

# --- retries, against the scripted server --------------------------------------------------------------------------
scripted <- function(entries, code, finish = NULL) {
  port <- as.integer(Sys.getenv("PARTWISE_FAKE_PORT", "5369"))
  script <- tempfile(fileext = ".json"); record <- tempfile(fileext = ".json")
  writeLines(jsonlite::toJSON(entries, auto_unbox = TRUE), script)
  server <- file.path(root, "src", "clients", "python", "tests", "scripted_server.py")
  system2("/usr/bin/python3", c(server, port, script, record), wait = FALSE, stdout = FALSE, stderr = FALSE)
  for (i in 1:100) { if (file.exists(record)) break; Sys.sleep(0.05) }
  if (!file.exists(record)) stop("the scripted server did not start on port ", port)
  sleeps <- numeric()
  client <- pw_client(paste0("http://127.0.0.1:", port), key = "k-123",
                      retry = pw_retry(attempts = 4, backoff = 0.01, sleep = function(s) sleeps <<- c(sleeps, s)))
  outcome <- tryCatch(code(client), error = function(e) e)
  if (!is.null(finish)) finish(port)
  for (i in 1:100) { if (file.exists(paste0(record, ".done"))) break; Sys.sleep(0.05) }  # its port is free again
  list(outcome = outcome, seen = jsonlite::fromJSON(record, simplifyVector = FALSE), sleeps = sleeps)
}
problem_body <- function(status) list(type = "/problems/x", title = "t", status = status, detail = "d",
                                      errors = list(list(pointer = "/samples/0", detail = "x")))
results_body <- list(results = list(list(sampleId = "a", distance = 1, squaredDistance = 1, pValue = 0.5, flagged = FALSE,
                                         reasons = list(), ruleViolations = list(), imputed = list(), duplicate = FALSE)))
one <- list(list(id = "a", values = list(Ca = 1, Mg = 2)))

test("503 and 429 are retried with the same body, honouring Retry-After; the key goes as a bearer token", {
  r <- scripted(list(list(status = 503, headers = list(`Retry-After` = "2"), body = problem_body(503)),
                     list(status = 429, headers = list(`Retry-After` = "1"), body = problem_body(429)),
                     list(status = 200, headers = list(`Content-Type` = "application/json"), body = results_body)),
                function(client) pw_screen(client, "b1", one))
  expect(is.data.frame(r$outcome) && r$outcome$sampleId == "a", paste("result:", format(r$outcome)))
  expect(length(r$seen) == 3, "three requests")
  expect(identical(r$sleeps, c(2, 1)), paste("sleeps", paste(r$sleeps, collapse = ",")))
  expect(length(unique(vapply(r$seen, function(s) s$body, ""))) == 1, "same body each time")
  expect(r$seen[[1]]$headers$Authorization == "Bearer k-123", "bearer key")
})

test("another 4xx is not retried and becomes a partwise_problem", {
  r <- scripted(list(list(status = 422, headers = list(`Content-Type` = "application/problem+json"), body = problem_body(422)),
                     list(status = 200, body = results_body)),
                function(client) pw_screen(client, "b1", one),
                # the server waits for its second answer's request: send it, so it exits
                finish = function(port) try(httr::GET(paste0("http://127.0.0.1:", port, "/")), silent = TRUE))
  expect(inherits(r$outcome, "partwise_problem") && r$outcome$status == 422 && identical(r$outcome$pointers, "/samples/0"), "problem")
  expect(length(r$seen) == 2 && r$seen[[2]]$method == "GET" && length(r$sleeps) == 0, "not retried")
})

test("connection errors back off, then the error is signalled", {
  sleeps <- numeric()
  client <- pw_client("http://127.0.0.1:9", retry = pw_retry(attempts = 3, backoff = 0.5, jitter = 0, sleep = function(s) sleeps <<- c(sleeps, s)))
  e <- tryCatch(pw_screen(client, "b1", one), error = function(e) e)
  expect(inherits(e, "error") && !inherits(e, "partwise_problem"), "a connection error")
  expect(identical(sleeps, c(0.5, 1)), paste("sleeps", paste(sleeps, collapse = ",")))
})

test("Retry-After as seconds or an HTTP-date (RFC 9110, 10.2.3)", {
  expect(pw_parse_retry_after("120") == 120, "seconds")
  now <- as.POSIXct(1445412480, origin = "1970-01-01", tz = "UTC")
  expect(pw_parse_retry_after("Wed, 21 Oct 2015 07:28:10 GMT", now) == 10, "date")
  expect(is.na(pw_parse_retry_after("soon")), "bad")
})

cat(sprintf("%d passed, %d failed\n", passed, failed))
quit(status = if (failed == 0 && passed > 0) 0 else 1)
