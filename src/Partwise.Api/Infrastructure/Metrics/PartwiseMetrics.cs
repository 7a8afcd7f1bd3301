using Partwise.Api.Baselines;
using Partwise.Api.Flags;
using Prometheus;

namespace Partwise.Api.Infrastructure.Metrics;

/// <summary>
/// The service's own Prometheus metrics, served at <c>/metrics</c> beside the HTTP metrics of
/// <see cref="MetricsSetup"/>. Every label has a bounded set of values: baseline ids (as many as baselines are
/// stored), flag statuses, endpoint names. Each recording method passes its argument through, so that a handler
/// records with a one-line change. One registry per process (the default), as Prometheus expects.
/// </summary>
public static class PartwiseMetrics
{
    /// <summary>The <c>baseline</c> label of screenings against a document sent with the samples (nothing stored).</summary>
    public const string InlineBaseline = "inline";

    private static readonly Counter Screenings = Prometheus.Metrics.CreateCounter(
        "partwise_screenings_total",
        "Samples screened: newly recorded against a stored baseline (a duplicate returns the stored result and is not counted), or against an inline document (baseline=\"inline\").",
        new CounterConfiguration { LabelNames = ["baseline", "flagged"] });

    private static readonly Counter FlagsRaised = Prometheus.Metrics.CreateCounter(
        "partwise_flags_raised_total",
        "Flags raised by newly recorded screenings, by baseline id.",
        new CounterConfiguration { LabelNames = ["baseline"] });

    private static readonly Counter FlagReviews = Prometheus.Metrics.CreateCounter(
        "partwise_flag_reviews_total",
        "Reviews of flags recorded, by the status given (confirmed, dismissed).",
        new CounterConfiguration { LabelNames = ["status"] });

    private static readonly Histogram SelectionDuration = Prometheus.Metrics.CreateHistogram(
        "partwise_selection_duration_seconds",
        "Time of one stepwise ratio selection: purpose=\"ratio-selection\" for /v1/ratio-selection, \"baseline\" for the coordinates of a baseline of type selection.",
        new HistogramConfiguration { LabelNames = ["purpose"], Buckets = Histogram.ExponentialBuckets(0.001, 2, 16) });

    private static readonly Histogram BaselineFitDuration = Prometheus.Metrics.CreateHistogram(
        "partwise_baseline_fit_duration_seconds",
        "Time of one baseline fit (zeros, coordinates, location and scatter), those that end in a problem document included.",
        new HistogramConfiguration { Buckets = Histogram.ExponentialBuckets(0.001, 2, 16) });

    private static readonly Counter StorageErrors = Prometheus.Metrics.CreateCounter(
        "partwise_storage_errors_total",
        "Requests answered 503 /problems/storage-unavailable, by operation (the endpoint's name, as the operationId of the OpenAPI document).",
        new CounterConfiguration { LabelNames = ["operation"] });

    /// <summary>Counts the screenings of one stored-baseline request that were recorded now, and the flags they raised.</summary>
    public static ScreeningResultItem[] Screened(string baselineId, ScreeningResultItem[] items)
    {
        ArgumentNullException.ThrowIfNull(items);
        foreach (var item in items.Where(i => !i.Duplicate))
        {
            Screenings.WithLabels(baselineId, item.Flagged ? "true" : "false").Inc();
            if (item.FlagId is not null)
            {
                FlagsRaised.WithLabels(baselineId).Inc();
            }
        }

        return items;
    }

    /// <summary>Counts the screenings of one inline-baseline request.</summary>
    public static ScreeningResultItem[] ScreenedInline(ScreeningResultItem[] items)
    {
        ArgumentNullException.ThrowIfNull(items);
        foreach (var item in items)
        {
            Screenings.WithLabels(InlineBaseline, item.Flagged ? "true" : "false").Inc();
        }

        return items;
    }

    /// <summary>Counts one recorded review.</summary>
    public static FlagItem Reviewed(FlagItem flag)
    {
        ArgumentNullException.ThrowIfNull(flag);
        FlagReviews.WithLabels(flag.Status).Inc();
        return flag;
    }

    /// <summary>Runs and times one ratio selection; <paramref name="purpose"/> is <c>ratio-selection</c> or <c>baseline</c>.</summary>
    public static T TimeSelection<T>(string purpose, Func<T> selection) => Time(SelectionDuration.WithLabels(purpose), selection);

    /// <summary>Runs and times one baseline fit.</summary>
    public static T TimeBaselineFit<T>(Func<T> fit) => Time(BaselineFitDuration, fit);

    /// <summary>Counts one request that the store could not serve, by the name of the endpoint it reached.</summary>
    public static void StorageUnavailable(string? operation) => StorageErrors.WithLabels(operation ?? "unknown").Inc();

    private static T Time<T>(IObserver histogram, Func<T> work)
    {
        ArgumentNullException.ThrowIfNull(work);
        var started = System.Diagnostics.Stopwatch.GetTimestamp();
        try
        {
            return work();
        }
        finally
        {
            histogram.Observe(System.Diagnostics.Stopwatch.GetElapsedTime(started).TotalSeconds);
        }
    }
}
