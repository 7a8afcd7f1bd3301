using System.Text.Json.Serialization;
using Partwise.Api.Baselines;
using Partwise.Api.Infrastructure;
using Partwise.Storage.Flags;

namespace Partwise.Api.Flags;

/// <summary>A flag: a statistical signal raised by a screening, for a qualified analyst to review. Not a decision.</summary>
/// <param name="Id">The flag's id.</param>
/// <param name="BaselineId">The baseline the sample was screened against.</param>
/// <param name="SampleId">The sample's id.</param>
/// <param name="ObservedAt">When the sample was taken, as sent, or null.</param>
/// <param name="Source">Where the sample came from, as sent, or null.</param>
/// <param name="ScreenedAt">When the screening was recorded (UTC).</param>
/// <param name="Distance">The Mahalanobis distance d.</param>
/// <param name="PValue">1 − F_χ²(d²; p).</param>
/// <param name="Reasons">The ratios with the largest |z| at screening.</param>
/// <param name="Status"><c>open</c> until reviewed, then <c>confirmed</c> or <c>dismissed</c>.</param>
/// <param name="Review">The latest review, or null while open.</param>
/// <param name="Values">The sample's values as sent (part name to value), or null for a flag raised before the service kept them.</param>
public sealed record FlagItem(
    string Id,
    string BaselineId,
    string SampleId,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] DateTimeOffset? ObservedAt,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] string? Source,
    DateTimeOffset ScreenedAt,
    double Distance,
    double PValue,
    IReadOnlyList<ReasonItem> Reasons,
    string Status,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] ReviewItem? Review,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] IReadOnlyDictionary<string, double>? Values)
{
    /// <summary>The wire form of a stored flag.</summary>
    public static FlagItem From(FlagRecord flag)
    {
        ArgumentNullException.ThrowIfNull(flag);
        return new(
            flag.Id,
            flag.BaselineId,
            flag.SampleId,
            flag.ObservedAt,
            flag.Source,
            flag.ScreenedAt,
            flag.Distance,
            flag.PValue,
            BaselineJson.Read<ReasonItem[]>(flag.ReasonsJson),
            FlagStatusNames.ToName(flag.Status),
            flag.Review is { } r ? new ReviewItem(FlagStatusNames.ToName(r.Status), r.Note, r.Reviewer, r.ReviewedAt) : null,
            flag.ValuesJson is { } values ? BaselineJson.Read<Dictionary<string, double>>(values) : null);
    }
}

/// <summary>The latest review of a flag.</summary>
/// <param name="Status"><c>confirmed</c> or <c>dismissed</c>.</param>
/// <param name="Note">The reviewer's note, or absent.</param>
/// <param name="Reviewer">Who reviewed, or absent.</param>
/// <param name="ReviewedAt">When (UTC).</param>
public sealed record ReviewItem(string Status, string? Note, string? Reviewer, DateTimeOffset ReviewedAt);

/// <summary>One page of flags, in the order they were committed.</summary>
/// <param name="Items">The flags.</param>
/// <param name="Next">The cursor to pass as <c>after</c> for the next page (also when this page is empty, to wait for new flags); null only when the listing had no cursor and found nothing.</param>
/// <param name="HasMore">True when more flags matched than <c>limit</c>.</param>
public sealed record FlagPageResponse(
    IReadOnlyList<FlagItem> Items,
    [property: JsonIgnore(Condition = JsonIgnoreCondition.Never)] string? Next,
    bool HasMore);

/// <summary>A review of a flag.</summary>
public sealed record ReviewRequest
{
    /// <summary><c>confirmed</c> (the signal is real) or <c>dismissed</c> (it does not matter).</summary>
    [System.ComponentModel.DataAnnotations.Required]
    [System.ComponentModel.DataAnnotations.AllowedValues("confirmed", "dismissed")]
    public string? Status { get; init; }

    /// <summary>The reviewer's note (at most 2,000 characters).</summary>
    public string? Note { get; init; }

    /// <summary>Who reviewed (at most 200 characters).</summary>
    public string? Reviewer { get; init; }

    /// <summary>Binds the request from a JSON body.</summary>
    public static ValueTask<ReviewRequest?> BindAsync(HttpContext context) => JsonBody.BindAsync<ReviewRequest>(context);
}
