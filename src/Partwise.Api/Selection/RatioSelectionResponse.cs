using Partwise.Api.Infrastructure;
using Partwise.Api.Shapes;

namespace Partwise.Api.Selection;

/// <summary>The path of a stepwise ratio selection.</summary>
/// <param name="TotalVariance">TV = Σ_j w_j var(clr_j) of all parts, with the divisor <c>divisor</c>.</param>
/// <param name="Divisor">The divisor of the total variance: <c>n</c> (explained fractions do not depend on it).</param>
/// <param name="Steps">One entry per ratio, forced ones first.</param>
/// <param name="Graph">The graph of the chosen ratios: a node per part or amalgamation, an edge per ratio from numerator to denominator.</param>
/// <param name="Invertible">Whether the chosen ratios determine the composition (then <c>/v1/ratio-sets/reconstruct</c> inverts them).</param>
/// <param name="Imputed">Every cell the zero policy replaced, with its value in the request's units (empty for moments).</param>
public sealed record RatioSelectionResponse(
    double TotalVariance,
    string Divisor,
    IReadOnlyList<SelectionStepItem> Steps,
    RatioGraphItem Graph,
    bool Invertible,
    IReadOnlyList<ImputedCellItem> Imputed) : IPictureResponse
{
    /// <inheritdoc />
    public string ToSvg() => SelectionPicture.Render(this);
}

/// <summary>One step of the selection.</summary>
/// <param name="Ratio">The ratio added, in the contract's Ratio shape (part names on each side; a named amalgamation as its parts).</param>
/// <param name="Label">Its label: <c>Na/Cl</c>, <c>hardness/Na</c>, <c>(Ca+Mg)/Na</c>, <c>g(Ca,Mg)/g(Na,K)</c>.</param>
/// <param name="Explained">The cumulative fraction of the total variance explained by the ratios so far, in [0, 1].</param>
/// <param name="Gain">This step's increase of <c>explained</c>.</param>
/// <param name="Procrustes">The Procrustes correlation between the samples in all log-ratios and in the ratios so far, in [0, 1] (Gower 1975).</param>
/// <param name="Forced">Whether the ratio was forced in rather than chosen.</param>
public sealed record SelectionStepItem(RatioOption Ratio, string Label, double Explained, double Gain, double Procrustes, bool Forced);

/// <summary>The graph of a ratio set.</summary>
/// <param name="Nodes">Node names (parts, named amalgamations, unnamed sums <c>(Ca+Mg)</c>, geometric means <c>g(Ca,Mg)</c>) in order of first use.</param>
/// <param name="Edges">One edge per ratio, in step order.</param>
/// <param name="Acyclic">Whether the graph, read as undirected, has no cycle.</param>
/// <param name="Connected">Whether the nodes form one connected component.</param>
public sealed record RatioGraphItem(IReadOnlyList<string> Nodes, IReadOnlyList<RatioEdgeItem> Edges, bool Acyclic, bool Connected);

/// <summary>One ratio as an edge.</summary>
/// <param name="From">The numerator's node.</param>
/// <param name="To">The denominator's node.</param>
/// <param name="Label">The ratio's label.</param>
public sealed record RatioEdgeItem(string From, string To, string Label);
