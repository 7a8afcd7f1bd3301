using Partwise.Api.Analysis;
using Partwise.Api.Baselines;
using Partwise.Api.Coordinates;
using Partwise.Api.Credentials;
using Partwise.Api.Flags;
using Partwise.Api.Health;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.Metrics;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Api.Review;
using Partwise.Api.Selection;
using Partwise.Api.Summary;

if (HashKeyCommand.TryRun(args))
{
    return 0;
}

if (HealthProbe.IsRequested(args))
{
    return await HealthProbe.RunAsync(args, Console.Error);
}

var builder = WebApplication.CreateBuilder(args);

builder.UseDefaultListenAddress();
builder.AddPartwiseLogging();
builder.Services.AddPartwiseLimits(builder.Configuration);
builder.Services.AddPartwiseProblems();
builder.Services.AddPartwiseJson();
builder.Services.AddPartwiseOpenApi();
builder.Services.AddPartwiseCredentials(builder.Configuration);
builder.Services.AddPartwiseStorage(builder.Configuration);
builder.Services.AddPartwiseBaselines(builder.Configuration);

var app = builder.Build();

app.UseRequestId();
app.UsePartwiseRequestLogging();
app.UsePartwiseMetrics();
app.UseExceptionHandler();
app.UseStatusCodeProblems();
app.UsePartwiseOpenApi();
app.UsePartwiseCredentials();
app.UseRateLimiter();
app.UseRequestTimeouts();

app.MapHealth();
app.MapPartwiseMetrics().AllowAnonymous();
app.MapCoordinates();
app.MapSummary();
app.MapSelection();
app.MapAnalysis();
app.MapBaselines();
app.MapScreenings();
app.MapFlags();
app.MapReviewPage();

app.Run();
return 0;
