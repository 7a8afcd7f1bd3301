namespace Partwise.Deployment.Tests.Support;

/// <summary>Files of the repository the tests read (found by walking up from the test assembly to service.sln).</summary>
internal static class Repository
{
    private static readonly Lazy<string> RootDirectory = new(() =>
    {
        for (var directory = new DirectoryInfo(AppContext.BaseDirectory); directory is not null; directory = directory.Parent)
        {
            if (File.Exists(Path.Combine(directory.FullName, "service.sln")))
            {
                return directory.FullName;
            }
        }

        throw new InvalidOperationException($"no service.sln above {AppContext.BaseDirectory}");
    });

    /// <summary>The repository's root directory.</summary>
    public static string Root => RootDirectory.Value;

    /// <summary>The full path of a file given relative to the root with '/' separators.</summary>
    public static string PathOf(string relative) => Path.Combine([Root, .. relative.Split('/')]);

    /// <summary>The text of a file given relative to the root.</summary>
    public static string Read(string relative) => File.ReadAllText(PathOf(relative));
}
