# Stored baselines, screening, flags and review.

pw_document <- function(response) {
  doc <- pw_parse(response)
  attr(doc, "json") <- structure(httr::content(response, as = "text", encoding = "UTF-8"), class = "json")
  doc
}

#' POST /v1/baselines (admin): fits and stores a screening baseline from reference samples; returns its document.
#' coordinates: NULL (ilr), "ilr", list(type = "ratios", ratios = c("Na/Cl", ...)) or list(type = "selection", maxRatios = 4);
#' scatter: "robust" (default) or "classical"; cutoff: the quantile (default 0.975);
#' rules: list(list(ratio = "Cl/HCO3", max = 0.5)). Not retried: each call stores a new baseline.
pw_create_baseline <- function(client, table, name, description = NULL, zeros = NULL, coordinates = NULL, scatter = NULL,
                               cutoff = NULL, rules = NULL, amalgamations = NULL, parts = NULL, ids = NULL) {
  if (is.character(coordinates)) coordinates <- list(type = coordinates)
  if (!is.null(coordinates$ratios)) coordinates$ratios <- pw_ratios(coordinates$ratios)
  if (!is.null(coordinates$amalgamations)) coordinates$amalgamations <- pw_amalgamations(coordinates$amalgamations)
  if (!is.null(rules)) rules <- lapply(rules, function(r) { r$ratio <- pw_ratio(r$ratio); r })
  body <- pw_table_body(table, parts, ids, name = name, description = description, zeros = pw_zeros(zeros),
                        coordinates = coordinates, scatter = scatter, cutoff = cutoff, rules = rules,
                        amalgamations = pw_amalgamations(amalgamations))
  pw_document(pw_request(client, "POST", "/v1/baselines", body = body, retry = FALSE, ok = 201L))
}

#' GET /v1/baselines: the stored baseline documents as a data frame (one row each); active = TRUE leaves out retired ones.
pw_baselines <- function(client, active = NULL) {
  query <- if (is.null(active)) NULL else list(active = tolower(as.character(active)))
  items <- pw_parse(pw_request(client, "GET", "/v1/baselines", query = query))$items
  if (length(items) == 0) data.frame() else items
}

#' GET /v1/baselines/{id}: one baseline document (a list; attr(, "json") keeps the text, so pw_screen_inline sends
#' it back exactly as it came).
pw_baseline <- function(client, id) pw_document(pw_request(client, "GET", paste0("/v1/baselines/", id)))

#' The newest stored baseline document named `name`, or NULL.
pw_find_baseline <- function(client, name) {
  all <- pw_baselines(client)
  if (!nrow(all)) return(NULL)
  mine <- all[all$name == name, , drop = FALSE]
  if (!nrow(mine)) return(NULL)
  pw_baseline(client, mine$id[order(mine$createdAt, mine$version, decreasing = TRUE)][1])
}

#' DELETE /v1/baselines/{id} (admin): retires it; screening it then signals a partwise_problem 410.
pw_retire_baseline <- function(client, id) {
  pw_request(client, "DELETE", paste0("/v1/baselines/", id), retry = FALSE, ok = 204L)
  invisible(NULL)
}

pw_results <- function(answer) {
  if (length(answer$results) == 0) data.frame() else answer$results
}

#' POST /v1/baselines/{id}/screenings: screens samples against a stored baseline.
#' samples: a data frame (row names or an "id" column: the sample ids; optional observedAt, source columns) or a
#' list of samples list(id, values, observedAt, source). Sent in batches of batch_size (at most 1,000 a request).
#' Connection errors, 503 and 429 are retried with backoff: the same sample ids make a retry idempotent (a sample
#' already screened comes back with duplicate = TRUE); the same id with other values is a partwise_problem 409.
#' Returns a data frame of results: sampleId, distance, squaredDistance, pValue, flagged, reasons (a list of data
#' frames: label, value, z, expected), ruleViolations, flagId, duplicate.
pw_screen <- function(client, baseline_id, samples, batch_size = 500, observed_at = NULL, source = NULL) {
  items <- pw_samples(samples, observed_at, source)
  batches <- split(items, ceiling(seq_along(items) / batch_size))
  out <- lapply(batches, function(batch) {
    pw_results(pw_post(client, paste0("/v1/baselines/", baseline_id, "/screenings"), list(samples = unname(batch))))
  })
  out <- Filter(nrow, out)
  if (!length(out)) data.frame() else do.call(rbind, unname(out))
}

#' POST /v1/screenings: screens samples against a baseline document sent with them (from pw_baseline or
#' pw_create_baseline); nothing is stored.
pw_screen_inline <- function(client, baseline, samples, observed_at = NULL, source = NULL) {
  items <- pw_json(list(samples = pw_samples(samples, observed_at, source)))
  doc <- attr(baseline, "json")
  if (is.null(doc)) doc <- jsonlite::toJSON(baseline, auto_unbox = TRUE, digits = NA, null = "null", na = "null")
  body <- structure(paste0('{"baseline":', doc, ',', substring(items, 2)), class = "json")
  pw_results(pw_post(client, "/v1/screenings", body))
}

#' GET /v1/flags: one page of flags.
#' status: "open" (default), "confirmed", "dismissed", "any"; after: the previous page's `next`; limit <= 500;
#' wait_seconds <= 30 waits for a flag (long poll); etag: a previous page's, sent as If-None-Match (304 while
#' nothing changed). Returns list(items = a data frame, next, has_more, etag, not_modified).
pw_flags <- function(client, baseline = NULL, status = NULL, after = NULL, limit = NULL, wait_seconds = NULL, etag = NULL) {
  query <- list(baseline = baseline, status = status, after = after, limit = limit, waitSeconds = wait_seconds)
  headers <- if (is.null(etag)) character() else c(`If-None-Match` = etag)
  wait <- if (is.null(wait_seconds)) 0 else wait_seconds
  response <- pw_request(client, "GET", "/v1/flags", query = query, headers = headers, ok = c(200L, 304L),
                         timeout = client$timeout + wait)
  tag <- httr::headers(response)[["etag"]]
  if (is.null(tag)) tag <- etag
  if (httr::status_code(response) == 304L) {
    return(list(items = data.frame(), `next` = after, has_more = FALSE, etag = tag, not_modified = TRUE))
  }
  page <- pw_parse(response)
  items <- if (length(page$items) == 0) data.frame() else page$items
  list(items = items, `next` = page$`next`, has_more = isTRUE(page$hasMore), etag = tag, not_modified = FALSE)
}

#' POST /v1/flags/{id}/review (reviewer): status "confirmed" or "dismissed", with a note and the reviewer's name;
#' returns the flag. Not retried.
pw_review_flag <- function(client, id, status, note = NULL, reviewer = NULL) {
  pw_post(client, paste0("/v1/flags/", id, "/review"), list(status = status, note = note, reviewer = reviewer), retry = FALSE)
}
