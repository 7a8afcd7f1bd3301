# Conversions between R tables and the service's Table shape list(parts, rows, ids).

#' The service's Table (parts, rows, ids) from a data frame, a matrix or a list of named numeric vectors.
#'
#' Data frame: one column per part; the sample ids are its row names (automatic row names 1..n send none) or a
#' column named "id". Matrix: column names are the parts, row names the ids. `parts` selects and orders columns
#' (required when they have no names); `ids` overrides the ids found. NA, NaN and infinite cells are sent as null
#' so that the service's problem document points at them.
pw_table <- function(data, parts = NULL, ids = NULL) {
  found <- NULL
  if (is.data.frame(data)) {
    if ("id" %in% names(data)) {
      found <- as.character(data$id)
      data <- data[, setdiff(names(data), "id"), drop = FALSE]
    } else if (.row_names_info(data) > 0) {
      found <- rownames(data)
    }
    if (is.null(parts)) parts <- names(data)
    m <- as.matrix(data[, parts, drop = FALSE])
  } else if (is.matrix(data)) {
    if (!is.null(rownames(data))) found <- rownames(data)
    if (is.null(parts)) parts <- colnames(data)
    if (is.null(parts)) stop("a matrix without column names needs `parts`")
    m <- if (!is.null(colnames(data))) data[, parts, drop = FALSE] else data
  } else if (is.list(data) && !is.null(data$rows)) {
    if (is.null(parts)) parts <- data$parts
    found <- data$ids
    m <- if (is.matrix(data$rows)) data$rows else do.call(rbind, lapply(data$rows, as.numeric))
  } else {
    stop("cannot make a table of a ", class(data)[1], ": give a data frame, a matrix or list(parts, rows)")
  }
  m <- matrix(as.numeric(m), nrow = nrow(m), dimnames = NULL)
  m[!is.finite(m)] <- NA
  table <- list(parts = I(as.character(parts)), rows = m)
  chosen <- if (!is.null(ids)) ids else found
  if (!is.null(chosen)) table$ids <- I(as.character(chosen))
  table
}

#' A data frame of an answer's table: columns named by `columns` (kept as given: "clr(Ca)", "Na/Cl"), row names the
#' sample ids (when the answer has them), and `attrs` (imputed, basis, ...) as attributes.
pw_frame <- function(columns, rows, ids = NULL, attrs = list()) {
  columns <- as.character(unlist(columns))
  m <- if (is.matrix(rows)) rows else if (length(rows)) do.call(rbind, lapply(rows, function(r) as.numeric(unlist(r)))) else matrix(numeric(), 0, length(columns))
  storage.mode(m) <- "double"
  frame <- as.data.frame(m, stringsAsFactors = FALSE)
  names(frame) <- columns
  if (!is.null(ids) && length(ids) == nrow(frame)) rownames(frame) <- as.character(unlist(ids))
  for (a in names(attrs)) attr(frame, a) <- attrs[[a]]
  frame
}

#' A Ratio of the contract: pw_ratio("Na/Cl"), pw_ratio(c("Ca", "Mg"), c("Na", "K"), "amalgamation").
pw_ratio <- function(num, den = NULL, kind = NULL) {
  if (is.list(num)) return(num)
  if (is.null(den)) {
    sides <- strsplit(num, "/", fixed = TRUE)[[1]]
    if (length(sides) != 2 || any(!nzchar(sides))) stop("'", num, "' is not a pairwise ratio like 'Na/Cl'")
    num <- sides[1]; den <- sides[2]
  }
  out <- list(num = I(as.character(num)), den = I(as.character(den)))
  if (!is.null(kind)) out$kind <- kind
  out
}

pw_ratios <- function(ratios) {
  if (is.null(ratios)) return(NULL)
  if (is.character(ratios)) return(lapply(ratios, pw_ratio))
  lapply(ratios, pw_ratio)
}

#' Screening samples list(id, values, observedAt, source) from a data frame (row names or an "id" column: the ids;
#' optional observedAt and source columns) or a list of samples already in that shape. Every sample needs an id.
pw_samples <- function(samples, observed_at = NULL, source = NULL) {
  meta <- c("id", "observedAt", "source")
  if (is.data.frame(samples)) {
    ids <- if ("id" %in% names(samples)) as.character(samples$id) else if (.row_names_info(samples) > 0) rownames(samples) else NULL
    if (is.null(ids)) stop("screening needs a sample id per row (row names or an id column): it makes a retry idempotent")
    parts <- setdiff(names(samples), meta)
    out <- lapply(seq_len(nrow(samples)), function(i) {
      v <- as.numeric(samples[i, parts])
      v[!is.finite(v)] <- NA
      s <- list(id = ids[i], values = as.list(stats::setNames(v, parts)))
      if ("observedAt" %in% names(samples)) s$observedAt <- as.character(samples$observedAt[i])
      if ("source" %in% names(samples)) s$source <- as.character(samples$source[i])
      s
    })
  } else {
    if (!is.null(samples$values)) samples <- list(samples)
    out <- lapply(samples, function(s) {
      if (is.null(s$id)) stop("every sample needs an id")
      s$values <- as.list(s$values)
      s
    })
  }
  lapply(out, function(s) {
    if (is.null(s$observedAt) && !is.null(observed_at)) s$observedAt <- observed_at
    if (is.null(s$source) && !is.null(source)) s$source <- source
    s
  })
}

#' The `moments` body of /v1/ratio-selection computed here: the sample covariance (divisor n - 1) of the natural
#' logs of the parts, then of each named amalgamation's sum, with names and count. Every value must be > 0.
pw_log_moments <- function(data, amalgamations = list(), parts = NULL) {
  t <- pw_table(data, parts)
  m <- t$rows
  if (anyNA(m) || any(m <= 0)) stop("a zero, negative or missing value: a log of it has no value")
  colnames(m) <- t$parts
  logs <- log(m)
  for (name in names(amalgamations)) {
    logs <- cbind(logs, log(rowSums(m[, amalgamations[[name]], drop = FALSE])))
    colnames(logs)[ncol(logs)] <- name
  }
  list(names = I(colnames(logs)), covariance = unname(stats::cov(logs)), count = nrow(logs))
}
