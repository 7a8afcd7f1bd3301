namespace Partwise.Api.Tests.Hostile;

/// <summary>The raw material of hostile requests: literals, header values, ids and query values.</summary>
public static class HostileValues
{
    /// <summary>
    /// Raw JSON texts put where a valid value stood: extreme and malformed numbers (overflow to infinity, negative
    /// zero, subnormals, huge exponents, digits past any integer type), wrong types, lone surrogates, long strings
    /// and deep nesting.
    /// </summary>
    public static readonly string[] JsonLiterals =
    [
        "1e308", "-1e308", "1.7976931348623157e308", "1.8e308", "-0", "-0.0", "0", "-1", "1e-320", "4.9e-324", "1e-400",
        "1e99999", "-1e99999", "1E+400", "123456789012345678901234567890", "2147483648", "-2147483649", "9223372036854775808",
        "0.1e-9999999999", "1.5", "NaN", "Infinity", "-Infinity", "\"NaN\"", "\"Infinity\"", "\"-0\"", "\"1e308\"", "null", "true",
        "false", "\"\"", "\" \"", "\"x\"", "[]", "{}", "[[]]", "[null]", "[1e308, -1e308]", "[\"a\", \"a\"]", "{\"\": null}",
        "\"\\ud800\"", "\"\\u0000\"", "\"a\\nb\"", "\"" + new string('w', 5000) + "\"", "01", ".5", "+1", "0x10", "1e", "--1",
        "1.", "\"2026-13-45T99:99:99Z\"", "\"../../etc\"", "{\"num\": [], \"den\": []}", "{\"type\": \"ilr\", \"partition\": []}",
        Nest("[", "]", 64), Nest("{\"a\": ", "}", 64), Nest("[", "]", 1000),
    ];

    /// <summary>Whole bodies that are not the request at all.</summary>
    public static readonly string[] JsonBodies =
    [
        "", " ", "null", "true", "0", "[]", "{}", "[{}]", "\"text\"", "{", "}", "{\"", "{\"a\"", "{\"a\":", "{\"a\": 1,}", "{,}",
        "{'parts': ['a']}", "{\"parts\": [\"a\", \"b\"], \"rows\": [[1, 2]]}{}", "\u0000", "NaN", "[1, 2, 3]",
        Nest("[", "]", 10_000), Nest("{\"a\": ", "}", 10_000), Nest("[", "]", 10_000)[..5_000],
    ];

    /// <summary>Content types sent with a valid body.</summary>
    public static readonly string[] ContentTypes =
    [
        "text/plain", "application/xml", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", "application/octet-stream",
        "application/json; charset=utf-16", "application/json; charset=latin1", "application/json; charset=nonsense", "text/csv; header=absent",
        "text/csv; charset=utf-32", "application/problem+json", "application/*", "*/*", "a/b", "application/json;;;", "APPLICATION/JSON",
        "text/json", "application/merge-patch+json", "image/svg+xml",
    ];

    /// <summary>Accept headers sent with a valid request.</summary>
    public static readonly string[] Accepts =
    [
        "application/xml", "image/png", "text/html", "text/csv", "image/svg+xml", "*/*;q=0", "application/json;q=0", "text/csv;q=2",
        "application/json;q=abc", "*/*;q=-1", ";;;", ",,,", "application/json, text/csv;q=0.5, image/svg+xml;q=0.9", "a/b/c",
        "application/" + new string('x', 4000), string.Join(", ", Enumerable.Range(0, 300).Select(i => $"type{i}/sub{i};q=0.{i % 10}")),
    ];

    /// <summary>If-None-Match headers for GET routes.</summary>
    public static readonly string[] IfNoneMatch =
    [
        "\"", "W/", "W/\"", "*", "abc", "\"\"", "\"unterminated", "W/\"x\", \"y\", ,", "\"a\" \"b\"", "\"" + new string('e', 3000) + "\"",
        string.Join(", ", Enumerable.Range(0, 500).Select(i => $"\"e{i}\"")),
    ];

    /// <summary>Path ids (already percent-encoded where needed).</summary>
    public static readonly string[] PathIds =
    [
        // No %00: the in-process test host refuses a path with a null character before the app sees it (the live
        // script in tests/hostile sends it to Kestrel).
        "x", "0", "-1", "%20", "%2F", "..", "%2E%2E%2Fetc", "b-", "'%20OR%201=1", "%E2%98%83", "%FF%FE", "%ZZ",
        new string('i', 5000), "a;b", "a%0Ab", "null", "1e308", "NaN",
    ];

    /// <summary>Query values (already percent-encoded where needed).</summary>
    public static readonly string[] QueryValues =
    [
        "", "%20", "0", "-0", "-1", "1e308", "-1e308", "1e-320", "NaN", "Infinity", "abc", "%ZZ", "%00", "%E2%98%83", "%FF",
        "1,2,,3", ",", "a,a", "2147483648", "0.5", "true", new string('q', 5000),
    ];

    /// <summary>Values for query parameters the flag list reads.</summary>
    public static readonly Dictionary<string, string[]> NamedQueryValues = new(StringComparer.Ordinal)
    {
        // waitSeconds: only values that are refused or wait no time, so the suite stays quick; one 1 s wait.
        ["waitSeconds"] = ["-1", "31", "1e9", "0.5", "abc", "", "0x1", "%201", "2147483648", "0", "1"],
        ["limit"] = ["0", "-1", "501", "1e3", "abc", "", "1.5", "2147483648", "99999999999999999999", "%00", "1", "500"],
        ["after"] = ["", "x", "====", "AAAA", "eyJ9", "%FF%FE", "-1", "0", new string('A', 4000), "c1.2.3", "%2F%2F"],
        ["status"] = ["", "OPEN", "open,confirmed", "deleted", "%00", "any", "dismissed", "1", new string('s', 2000)],
    };

    /// <summary>Methods tried on routes that do not map them.</summary>
    public static readonly string[] Methods = ["GET", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"];

    /// <summary><paramref name="open"/> <paramref name="depth"/> times, 1, then <paramref name="close"/> as often.</summary>
    public static string Nest(string open, string close, int depth) =>
        string.Concat(Enumerable.Repeat(open, depth)) + "1" + string.Concat(Enumerable.Repeat(close, depth));
}
