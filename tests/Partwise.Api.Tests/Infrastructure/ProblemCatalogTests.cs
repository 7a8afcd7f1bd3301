using Partwise.Api.Infrastructure;
using Partwise.Core.Problems;

namespace Partwise.Api.Tests.Infrastructure;

public class ProblemCatalogTests
{
    [Theory]
    [InlineData(ProblemTypes.InvalidInput, 400)]
    [InlineData(ProblemTypes.TooLarge, 413)]
    [InlineData(ProblemTypes.UnsupportedMediaType, 415)]
    [InlineData(ProblemTypes.ZeroValue, 422)]
    [InlineData(ProblemTypes.UnknownPart, 422)]
    [InlineData(ProblemTypes.ComputationLimit, 422)]
    [InlineData(ProblemTypes.SingularRatioSet, 422)]
    [InlineData("/problems/some-future-problem", 422)]
    public void EachProblemTypeHasOneStatus(string type, int status) => Assert.Equal(status, ProblemCatalog.StatusOf(type));

    [Fact]
    public void EveryCoreProblemTypeHasItsOwnTitle()
    {
        var types = typeof(ProblemTypes).GetFields().Select(f => (string)f.GetValue(null)!).ToArray();
        var titles = types.Select(ProblemCatalog.TitleOf).ToArray();
        Assert.Equal(types.Length, titles.Distinct().Count());
    }

    [Fact]
    public void TheDocumentListsEveryPointer()
    {
        var problem = ProblemCatalog.ToProblemDetails(new CompositionException(ProblemTypes.ZeroValue, "two zeros", [new ProblemError("/rows/0/1", "zero"), new ProblemError("/rows/2/0", "zero")]));
        Assert.Equal(422, problem.Status);
        Assert.Equal("/problems/zero-value", problem.Type);
        var errors = Assert.IsType<ProblemErrorItem[]>(problem.Extensions["errors"]);
        Assert.Equal(["/rows/0/1", "/rows/2/0"], errors.Select(e => e.Pointer));
    }
}
