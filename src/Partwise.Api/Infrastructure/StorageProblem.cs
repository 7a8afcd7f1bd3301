using Microsoft.AspNetCore.Mvc;
using Partwise.Core.Problems;

namespace Partwise.Api.Infrastructure;

/// <summary>The 503 problem document for a store that cannot be reached; nothing of the failed request was stored.</summary>
public static class StorageProblem
{
    /// <summary>The <c>Retry-After</c> header sent with the 503, in seconds.</summary>
    public const string RetryAfterSeconds = "5";

    /// <summary>The problem document. It names no host, file or connection detail: those go to the log only.</summary>
    public static ProblemDetails Details() => ProblemCatalog.Create(
        ProblemTypes.StorageUnavailable,
        "The database cannot be reached or cannot take the operation now; nothing of this request was stored. Retry later.",
        []);
}
