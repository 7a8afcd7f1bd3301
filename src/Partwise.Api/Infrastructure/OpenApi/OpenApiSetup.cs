using Microsoft.OpenApi;
using Swashbuckle.AspNetCore.Swagger;

namespace Partwise.Api.Infrastructure.OpenApi;

/// <summary>The OpenAPI 3.1 document at <c>/openapi/v1.json</c> and the interactive page at <c>/docs</c>.</summary>
public static class OpenApiSetup
{
    /// <summary>The document name; also the file <c>openapi/partwise.v1.json</c> made at build time.</summary>
    public const string DocumentName = "v1";

    /// <summary>The short description at the top of the document.</summary>
    public const string Description =
        "Compositional data analysis over HTTP: closure and zero handling, log-ratio coordinates (clr, alr, ilr, " +
        "pairwise, expert ratio sets) and their inverses, summaries of log-ratio variance, Aitchison distances, and " +
        "stored screening baselines with idempotent screening and a queue of flags for review. " +
        "Every table endpoint takes JSON or text/csv and answers in JSON, or text/csv when `Accept` asks for it. " +
        "Errors are RFC 9457 problem documents with JSON pointers into the request.\n\n" +
        "Screening flags, where this service gives them, are statistical signals for review by a qualified analyst, " +
        "not decisions: where results bear on drinking water, food, health or safety, accredited methods, local " +
        "regulations and licensed practice decide.";

    /// <summary>Registers the generator.</summary>
    public static IServiceCollection AddPartwiseOpenApi(this IServiceCollection services)
    {
        services.AddEndpointsApiExplorer();
        services.AddSwaggerGen(options =>
        {
            options.SwaggerDoc(DocumentName, new OpenApiInfo
            {
                Title = "Partwise",
                Version = "v1",
                Description = Description,
            });
            options.IncludeXmlComments(typeof(OpenApiSetup).Assembly);
            options.SupportNonNullableReferenceTypes();
            options.SchemaFilter<ProblemDetailsSchemaFilter>();
            options.SchemaFilter<ContractSchemaFilter>();
            options.OperationFilter<CsvOperationFilter>();
            options.OperationFilter<PictureOperationFilter>();
            options.OperationFilter<EndpointTextFilter>();
            options.OperationFilter<Credentials.CredentialsOperationFilter>();
            options.AddSecurityDefinition(Credentials.CredentialsOperationFilter.SchemeId, Credentials.CredentialsOperationFilter.Scheme());
            options.OperationFilter<Flags.FlagListOperationFilter>();
            OpenApiSchemas.MapShapes(options);
        });
        services.Configure<SwaggerOptions>(o => o.OpenApiVersion = OpenApiSpecVersion.OpenApi3_1);
        return services;
    }

    /// <summary>Serves the document and the page.</summary>
    public static WebApplication UsePartwiseOpenApi(this WebApplication app)
    {
        app.UseSwagger(o => o.RouteTemplate = "openapi/{documentName}.json");
        app.UseSwaggerUI(o =>
        {
            o.RoutePrefix = "docs";
            o.DocumentTitle = "Partwise API";
            o.SwaggerEndpoint($"/openapi/{DocumentName}.json", "Partwise v1");
        });
        return app;
    }
}
