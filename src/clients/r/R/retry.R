# When and how long to wait before sending a request again.

#' A retry policy for requests that are safe to repeat (GETs, the stateless computations, screenings).
#'
#' A request is tried again after a connection error or timeout, or an answer of 503 or 429, at most `attempts`
#' times in all. The wait is the answer's Retry-After when it has one (capped at `max_delay`), else
#' `backoff * 2^k` for the k-th retry (capped at `max_delay`) less up to `jitter` of it at random. No other 4xx is
#' retried. Screenings are idempotent on (baseline, sample id), so resending the same samples is safe.
pw_retry <- function(attempts = 5, backoff = 0.5, max_delay = 30, jitter = 0.25, sleep = Sys.sleep) {
  stopifnot(attempts >= 1)
  structure(list(attempts = as.integer(attempts), backoff = backoff, max_delay = max_delay, jitter = jitter, sleep = sleep),
            class = "partwise_retry")
}

pw_retry_delay <- function(policy, retry, retry_after = NA_real_) {
  if (!is.na(retry_after)) return(min(policy$max_delay, max(0, retry_after)))
  base <- min(policy$max_delay, policy$backoff * 2^retry)
  base * (1 - policy$jitter * stats::runif(1))
}

#' Seconds from a Retry-After header: delay-seconds or an HTTP-date (RFC 9110, 10.2.3); NA when absent or bad.
pw_parse_retry_after <- function(value, now = Sys.time()) {
  if (is.null(value) || is.na(value)) return(NA_real_)
  value <- trimws(value)
  if (grepl("^[0-9]+$", value)) return(as.numeric(value))
  when <- suppressWarnings(httr::parse_http_date(value))
  if (is.na(when)) return(NA_real_)
  max(0, as.numeric(difftime(when, now, units = "secs")))
}
