# The client object and the one place where requests are sent, retried and turned into conditions.

#' A client of one Partwise service.
#'
#' url: the base address (default $PARTWISE_URL, else http://127.0.0.1:5080). key: sent as
#' "Authorization: Bearer <key>" (default $PARTWISE_KEY; none when empty: with no key configured the service
#' serves loopback callers). timeout: seconds per request (long polls add their wait). retry: a pw_retry() policy
#' for the requests that are safe to repeat; pw_retry(attempts = 1) for none.
pw_client <- function(url = NULL, key = NULL, timeout = 60, retry = pw_retry()) {
  if (is.null(url) || !nzchar(url)) url <- Sys.getenv("PARTWISE_URL", "")
  if (!nzchar(url)) url <- "http://127.0.0.1:5080"
  if (is.null(key)) key <- Sys.getenv("PARTWISE_KEY", "")
  structure(list(url = sub("/+$", "", url), key = if (nzchar(key)) key else NULL, timeout = timeout, retry = retry),
            class = "partwise_client")
}

print.partwise_client <- function(x, ...) {
  cat("<partwise client ", x$url, if (!is.null(x$key)) " with a key" else "", ">\n", sep = "")
  invisible(x)
}

pw_compact <- function(x) x[!vapply(x, is.null, logical(1))]

pw_json <- function(body) {
  if (inherits(body, "json")) return(body)
  jsonlite::toJSON(pw_compact(body), auto_unbox = TRUE, digits = NA, na = "null", null = "null")
}

#' Sends one request; returns the httr response, or signals a partwise_problem for a status not in `ok`.
#' retry = TRUE uses the client's policy (only for requests that are safe to repeat: GETs, computations, screenings).
pw_request <- function(client, method, path, body = NULL, query = NULL, headers = character(), retry = TRUE,
                       ok = 200L, timeout = NULL, accept = "application/json") {
  policy <- if (retry) client$retry else pw_retry(attempts = 1)
  url <- paste0(client$url, path)
  hdr <- c(Accept = accept, headers)
  if (!is.null(client$key)) hdr <- c(hdr, Authorization = paste("Bearer", client$key))
  payload <- if (is.null(body)) NULL else pw_json(body)
  if (!is.null(payload)) hdr <- c(hdr, `Content-Type` = "application/json")
  query <- if (is.null(query)) NULL else pw_compact(query)
  for (attempt in seq_len(policy$attempts)) {
    last <- attempt == policy$attempts
    response <- tryCatch(
      httr::VERB(method, url, body = if (is.null(payload)) NULL else as.character(payload), query = query,
                 httr::add_headers(.headers = hdr), httr::timeout(if (is.null(timeout)) client$timeout else timeout)),
      error = function(e) e)
    if (inherits(response, "error")) {
      if (last) stop(response)
      policy$sleep(pw_retry_delay(policy, attempt - 1))
      next
    }
    status <- httr::status_code(response)
    if (status %in% ok) return(response)
    retry_after <- pw_parse_retry_after(httr::headers(response)[["retry-after"]])
    if (!last && status %in% c(429L, 503L)) {
      policy$sleep(pw_retry_delay(policy, attempt - 1, retry_after))
      next
    }
    stop(pw_problem_of(response, method, url, retry_after))
  }
}

pw_problem_of <- function(response, method, url, retry_after) {
  text <- httr::content(response, as = "text", encoding = "UTF-8")
  problem <- tryCatch(jsonlite::fromJSON(text, simplifyVector = TRUE), error = function(e) NULL)
  status <- httr::status_code(response)
  if (!is.list(problem)) {
    problem <- list(type = "about:blank", title = httr::http_status(response)$reason, status = status,
                    detail = substr(if (is.null(text) || is.na(text)) "" else text, 1, 500))
  }
  rid <- httr::headers(response)[["x-request-id"]]
  partwise_problem(problem, status, method, url, if (is.null(rid)) NA_character_ else rid, retry_after)
}

pw_parse <- function(response, simplify = TRUE) {
  jsonlite::fromJSON(httr::content(response, as = "text", encoding = "UTF-8"), simplifyVector = simplify)
}

pw_post <- function(client, path, body, retry = TRUE, ok = 200L, svg = FALSE) {
  response <- pw_request(client, "POST", path, body = body, retry = retry, ok = ok,
                         accept = if (svg) "image/svg+xml" else "application/json")
  if (svg) httr::content(response, as = "text", encoding = "UTF-8") else pw_parse(response)
}

pw_zeros <- function(zeros) {
  if (is.null(zeros)) return(NULL)
  if (is.character(zeros)) return(list(method = zeros))
  limits <- zeros$detectionLimits
  if (!is.null(limits) && (length(limits) > 1 || !is.null(names(limits)))) {
    zeros$detectionLimits <- as.list(zeros$detectionLimits)
  }
  zeros
}

pw_transform <- function(transform) {
  if (is.character(transform)) return(list(type = transform))
  if (!is.null(transform$ratios)) transform$ratios <- pw_ratios(transform$ratios)
  if (!is.null(transform$weights) && !is.character(transform$weights)) transform$weights <- as.list(transform$weights)
  transform
}

pw_weights <- function(weights) {
  if (is.null(weights) || is.character(weights)) weights else as.list(weights)
}

pw_amalgamations <- function(amalgamations) {
  if (is.null(amalgamations)) NULL else lapply(amalgamations, function(p) I(as.character(p)))
}

pw_rows_and_ids <- function(data) {
  if (is.data.frame(data)) {
    ids <- if (.row_names_info(data) > 0) rownames(data) else NULL
    data <- as.matrix(data)
  } else if (is.matrix(data)) {
    ids <- rownames(data)
  } else {
    stop("give a data frame or a matrix of numbers")
  }
  m <- matrix(as.numeric(data), nrow = nrow(data))
  m[!is.finite(m)] <- NA
  list(rows = m, ids = if (is.null(ids)) NULL else I(as.character(ids)))
}
