# The stateless computations: one function per endpoint. Tables go in as data frames (row names: sample ids) and
# come back as data frames with the sample ids as row names; the rest of an answer is kept in attributes or lists.

#' GET /healthz: list(status) while the process is alive.
pw_health <- function(client) pw_parse(pw_request(client, "GET", "/healthz"))

#' GET /readyz: list(status) when storage is reachable; a partwise_problem 503 otherwise (not retried).
pw_ready <- function(client) pw_parse(pw_request(client, "GET", "/readyz", retry = FALSE))

pw_table_body <- function(table, parts = NULL, ids = NULL, ...) c(pw_table(table, parts, ids), pw_compact(list(...)))

pw_answer_frame <- function(answer, columns = "columns", extra = character()) {
  pw_frame(answer[[columns]], answer$rows, answer$ids, answer[intersect(extra, names(answer))])
}

#' POST /v1/compositions/prepare: the table closed to `total` (default 1) after zero replacement.
#' zeros: NULL (reject), "multiplicative", or list(method = "multiplicative", detectionLimits = c(NO3 = 0.05), fraction = 0.65).
#' Returns a data frame; attr(, "imputed") lists the replaced cells (row 0-based, part, value).
pw_prepare <- function(client, table, zeros = NULL, total = NULL, parts = NULL, ids = NULL) {
  answer <- pw_post(client, "/v1/compositions/prepare", pw_table_body(table, parts, ids, zeros = pw_zeros(zeros), total = total))
  pw_answer_frame(answer, "parts", "imputed")
}

#' POST /v1/coordinates: log-ratio coordinates of every row.
#' transform: "clr", "alr", "ilr", "pairwise", or a list such as list(type = "alr", denominator = "Cl"),
#' list(type = "ilr", partition = <matrix>), list(type = "ratios", ratios = c("Na/Cl", "Cl/HCO3")).
#' Returns a data frame named by the coordinates' labels; attributes "imputed" and (ilr) "basis".
pw_coordinates <- function(client, table, transform = "clr", zeros = NULL, parts = NULL, ids = NULL) {
  answer <- pw_post(client, "/v1/coordinates", pw_table_body(table, parts, ids, zeros = pw_zeros(zeros), transform = pw_transform(transform)))
  pw_answer_frame(answer, "columns", c("imputed", "basis"))
}

#' POST /v1/coordinates/inverse: compositions (closed to `total`) from a data frame or matrix of coordinates.
pw_inverse <- function(client, coordinates, parts, transform = "clr", total = NULL) {
  r <- pw_rows_and_ids(coordinates)
  body <- list(parts = I(as.character(parts)), rows = r$rows, ids = r$ids, transform = pw_transform(transform), total = total)
  pw_answer_frame(pw_post(client, "/v1/coordinates/inverse", body), "parts")
}

#' POST /v1/summary: center and partContributions as named vectors, variationMatrix and clrCovariance as matrices
#' named by part, and totalVariance, divisor, weights, imputed as sent.
pw_summary <- function(client, table, zeros = NULL, weights = NULL, parts = NULL) {
  answer <- pw_post(client, "/v1/summary", pw_table_body(table, parts, zeros = pw_zeros(zeros), weights = pw_weights(weights)))
  names <- answer$parts
  for (k in intersect(c("center", "partContributions"), names(answer))) answer[[k]] <- stats::setNames(answer[[k]], names)
  for (k in intersect(c("variationMatrix", "clrCovariance"), names(answer))) dimnames(answer[[k]]) <- list(names, names)
  answer
}

#' POST /v1/distances: the Aitchison distance matrix (a matrix with the sample ids as dimnames; at most 5,000 rows;
#' stats::as.dist() takes it); attr(, "imputed").
pw_distances <- function(client, table, zeros = NULL, parts = NULL, ids = NULL) {
  answer <- pw_post(client, "/v1/distances", pw_table_body(table, parts, ids, zeros = pw_zeros(zeros)))
  m <- answer$matrix
  if (!is.null(answer$ids)) dimnames(m) <- list(answer$ids, answer$ids)
  attr(m, "imputed") <- answer$imputed
  m
}

#' POST /v1/ratio-selection: the stepwise choice of log-ratios explaining the most log-ratio variance.
#' Give `table` or `moments` (list(names, covariance, count), see pw_log_moments). amalgamations:
#' list(hardness = c("Ca", "Mg")); force: ratios always in; exclude: parts never used; max_ratios, explained: stops.
#' Returns a list: totalVariance, divisor, steps (a data frame: label, explained, gain, procrustes, forced, ratio),
#' graph, invertible; the SVG text with svg = TRUE.
pw_select_ratios <- function(client, table = NULL, moments = NULL, zeros = NULL, amalgamations = NULL, force = NULL,
                             exclude = NULL, max_ratios = NULL, explained = NULL, weights = NULL, parts = NULL, svg = FALSE) {
  if (is.null(table) == is.null(moments)) stop("give either a table or moments")
  body <- if (!is.null(table)) pw_table(table, parts) else list(moments = moments)
  stop_at <- pw_compact(list(maxRatios = max_ratios, explained = explained))
  body <- c(body, pw_compact(list(zeros = pw_zeros(zeros), amalgamations = pw_amalgamations(amalgamations),
                                  force = pw_ratios(force), exclude = if (is.null(exclude)) NULL else I(exclude),
                                  stop = if (length(stop_at)) stop_at else NULL, weights = pw_weights(weights))))
  pw_post(client, "/v1/ratio-selection", body, svg = svg)
}

#' POST /v1/ratio-sets/evaluate: explained, procrustes, rank, invertible and perRatio (a data frame) of a chosen set.
pw_evaluate_ratios <- function(client, table, ratios, zeros = NULL, weights = NULL, parts = NULL) {
  body <- pw_table_body(table, parts, zeros = pw_zeros(zeros), ratios = pw_ratios(ratios), weights = pw_weights(weights))
  pw_post(client, "/v1/ratio-sets/evaluate", body)
}

#' POST /v1/ratio-sets/reconstruct: compositions from the values (natural logs) of an invertible set of ratios,
#' one column per ratio in the order of `ratios`.
pw_reconstruct <- function(client, values, parts, ratios, total = NULL) {
  r <- pw_rows_and_ids(values)
  body <- list(parts = I(as.character(parts)), ratios = pw_ratios(ratios), rows = r$rows, ids = r$ids, total = total)
  pw_answer_frame(pw_post(client, "/v1/ratio-sets/reconstruct", body), "parts")
}

#' POST /v1/lra: log-ratio analysis (singularValues, inertia, rows$principal, parts$standard, ...); the biplot of
#' dimensions 1 and 2 as SVG text with svg = TRUE.
pw_lra <- function(client, table, zeros = NULL, weights = NULL, dimensions = NULL, parts = NULL, svg = FALSE) {
  body <- pw_table_body(table, parts, zeros = pw_zeros(zeros), weights = pw_weights(weights), dimensions = dimensions)
  pw_post(client, "/v1/lra", body, svg = svg)
}
