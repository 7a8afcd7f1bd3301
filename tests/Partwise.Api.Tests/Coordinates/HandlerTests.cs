using Microsoft.AspNetCore.Http.HttpResults;
using Microsoft.Extensions.Options;
using Partwise.Api.Coordinates;
using Partwise.Api.Infrastructure;
using Partwise.Api.Tests.Support;
using Serilog.Extensions.Hosting;

namespace Partwise.Api.Tests.Coordinates;

/// <summary>Handlers are plain static methods: called directly, without HTTP.</summary>
public class HandlerTests
{
    private static readonly DiagnosticContext Log = new(null);

    [Fact]
    public void TheForwardHandlerReturnsClrCoordinates()
    {
        var request = new CoordinatesRequest { Parts = WorkedExample.Parts, Rows = [[1, 2, 4]], Transform = new TransformOption { Type = "clr" } };
        var result = CoordinatesEndpoints.Forward(request, Options.Create(new LimitsOptions()), Log);
        var ok = Assert.IsType<TableOk<CoordinatesResponse>>(result.Result);

        // clr(1, 2, 4) = (−l, 0, l), l = ln 2 (Aitchison 1986).
        for (var k = 0; k < 3; k++)
        {
            Tolerance.Close(WorkedExample.Clr1[k], ok.Value.Rows.Values[k]);
        }
    }

    [Fact]
    public void TheForwardHandlerReturnsAProblemForAZero()
    {
        var request = new CoordinatesRequest { Parts = WorkedExample.Parts, Rows = [[1, 0, 4]], Transform = new TransformOption { Type = "clr" } };
        var result = CoordinatesEndpoints.Forward(request, Options.Create(new LimitsOptions()), Log);
        var problem = Assert.IsType<ProblemHttpResult>(result.Result);
        Assert.Equal(422, problem.StatusCode);
        Assert.Equal("/problems/zero-value", problem.ProblemDetails.Type);
    }

    [Fact]
    public void ThePrepareHandlerReportsImputedCellsInClosedUnits()
    {
        var request = new PrepareRequest
        {
            Parts = ["a", "b"],
            Rows = [[0, 10]],
            Zeros = new Partwise.Api.Shapes.ZerosOption { Method = "multiplicative", DetectionLimits = new Partwise.Api.Shapes.DetectionLimits(1, null), Fraction = 0.5 },
            Total = 100,
        };
        var ok = Assert.IsType<TableOk<PrepareResponse>>(CoordinatesEndpoints.Prepare(request, Log).Result);

        // δ = 0.5, c = 10 (Martín-Fernández et al. 2003): (0.5, 9.5), closed to 100: (5, 95).
        var cell = Assert.Single(ok.Value.Imputed);
        Tolerance.Close(5, cell.Value, 1e-12);
        Tolerance.Close(95, ok.Value.Rows.Values[1], 1e-12);
    }
}
