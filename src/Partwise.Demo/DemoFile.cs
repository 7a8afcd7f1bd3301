namespace Partwise.Demo;

/// <summary>One generated demo file.</summary>
/// <param name="Name">The file name under <c>demo/</c>.</param>
/// <param name="Purpose">What it is for, one sentence (also written into <c>demo/README.md</c>).</param>
/// <param name="Usage">How to post it, as a curl command against <c>$PARTWISE_URL</c>, or null.</param>
/// <param name="Content">The file's text, LF line endings, ending with a newline.</param>
public sealed record DemoFile(string Name, string Purpose, string? Usage, string Content);
