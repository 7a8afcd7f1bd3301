using Partwise.Api.Analysis;
using Partwise.Api.Baselines;
using Partwise.Api.Coordinates;
using Partwise.Api.Flags;
using Partwise.Api.Health;
using Partwise.Api.Infrastructure;
using Partwise.Api.Infrastructure.OpenApi;
using Partwise.Api.Selection;
using Partwise.Api.Summary;

var builder = WebApplication.CreateBuilder(args);

builder.UseDefaultListenAddress();
builder.AddPartwiseLogging();
builder.Services.AddPartwiseLimits(builder.Configuration);
builder.Services.AddPartwiseProblems();
builder.Services.AddPartwiseJson();
builder.Services.AddPartwiseOpenApi();
builder.Services.AddPartwiseStorage(builder.Configuration);
builder.Services.AddPartwiseBaselines(builder.Configuration);

var app = builder.Build();

app.UseRequestId();
app.UsePartwiseRequestLogging();
app.UseExceptionHandler();
app.UseStatusCodeProblems();
app.UseRateLimiter();
app.UseRequestTimeouts();
app.UsePartwiseOpenApi();

app.MapHealth();
app.MapCoordinates();
app.MapSummary();
app.MapSelection();
app.MapAnalysis();
app.MapBaselines();
app.MapScreenings();
app.MapFlags();

app.Run();
