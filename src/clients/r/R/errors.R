# The condition signalled for every 4xx/5xx answer: it carries the service's RFC 9457 problem document.

#' A condition of class c("partwise_problem", "error", "condition") made from an error answer.
#'
#' Fields: problem (the problem document as a list, or one made from the status when the body was not
#' application/problem+json), type (e.g. "/problems/zero-value"; "about:blank" when none), title, status (integer),
#' detail, errors (a data frame of pointer and detail: RFC 6901 JSON pointers into the request), pointers (a
#' character vector), request_id (X-Request-Id), retry_after (seconds or NA), method, url.
#' Catch it with tryCatch(..., partwise_problem = function(p) ...).
partwise_problem <- function(problem, status, method = NA_character_, url = NA_character_,
                             request_id = NA_character_, retry_after = NA_real_) {
  field <- function(name, default) if (!is.null(problem[[name]])) problem[[name]] else default
  errors <- field("errors", list())
  if (is.data.frame(errors)) {
    errors <- data.frame(pointer = as.character(errors$pointer), detail = as.character(errors$detail), stringsAsFactors = FALSE)
  } else {
    errors <- data.frame(pointer = vapply(errors, function(e) as.character(e$pointer %||% NA), ""),
                         detail = vapply(errors, function(e) as.character(e$detail %||% NA), ""), stringsAsFactors = FALSE)
  }
  structure(
    class = c("partwise_problem", "error", "condition"),
    list(message = NULL, call = NULL, problem = problem, status = as.integer(field("status", status)),
         type = field("type", "about:blank"), title = field("title", ""), detail = field("detail", ""),
         errors = errors, pointers = errors$pointer, request_id = request_id, retry_after = retry_after,
         method = method, url = url))
}

`%||%` <- function(a, b) if (is.null(a)) b else a

#' The message of a partwise_problem: status, type, title, detail and one line per pointer.
conditionMessage.partwise_problem <- function(c) {
  head <- paste0(c$status, " ", c$type, if (nzchar(c$title)) paste0(": ", c$title) else "",
                 if (nzchar(c$detail)) paste0(" (", c$detail, ")") else "")
  lines <- if (nrow(c$errors)) paste0("  at ", c$errors$pointer, ": ", c$errors$detail) else character()
  req <- if (!is.na(c$url)) paste0("  request: ", c$method, " ", c$url,
                                   if (!is.na(c$request_id)) paste0(" [X-Request-Id ", c$request_id, "]") else "") else character()
  paste(c(head, lines, req), collapse = "\n")
}
