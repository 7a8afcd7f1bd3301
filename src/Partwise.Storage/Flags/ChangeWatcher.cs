using System.Diagnostics;

namespace Partwise.Storage.Flags;

/// <summary>
/// Wakes waiters when the change token moves. Changes committed through this store instance are reported at once
/// (<see cref="Observe"/>); changes by other connections are found by one poll loop, which runs only while someone
/// waits, whatever their number.
/// </summary>
internal sealed class ChangeWatcher(Func<CancellationToken, Task<ChangeToken>> read, TimeSpan interval) : IDisposable
{
    private readonly Lock gate = new();
    private readonly CancellationTokenSource stopping = new();
    private ChangeToken? latest;
    private TaskCompletionSource<ChangeToken> next = NewSignal();
    private int waiters;
    private bool polling;

    /// <summary>Reports a token read or committed; wakes the waiters when it is later than any seen before.</summary>
    public void Observe(ChangeToken token)
    {
        TaskCompletionSource<ChangeToken> fired;
        lock (gate)
        {
            if (latest is { } known && !token.IsLaterThan(known))
            {
                return;
            }

            latest = token;
            fired = next;
            next = NewSignal();
        }

        fired.TrySetResult(token);
    }

    /// <summary>Waits for a token other than <paramref name="since"/>; returns <paramref name="since"/> after <paramref name="timeout"/>.</summary>
    public async Task<ChangeToken> WaitAsync(ChangeToken since, TimeSpan timeout, CancellationToken cancellationToken)
    {
        Task<ChangeToken> signal;
        lock (gate)
        {
            if (latest is { } known && known.IsLaterThan(since))
            {
                return known;
            }

            signal = next.Task;
            waiters++;
            if (!polling)
            {
                polling = true;
                _ = Task.Run(PollAsync, CancellationToken.None);
            }
        }

        var clock = Stopwatch.StartNew();
        try
        {
            while (true)
            {
                var remaining = timeout - clock.Elapsed;
                if (remaining <= TimeSpan.Zero)
                {
                    return since;
                }

                try
                {
                    var token = await signal.WaitAsync(remaining, cancellationToken);
                    if (token.IsLaterThan(since))
                    {
                        return token;
                    }
                }
                catch (TimeoutException)
                {
                    return since;
                }

                lock (gate)
                {
                    signal = next.Task;
                }
            }
        }
        finally
        {
            lock (gate)
            {
                waiters--;
            }
        }
    }

    // Cancels without disposing the source: a poll loop still running reads its token once more on the way out.
    public void Dispose() => stopping.Cancel();

    private async Task PollAsync()
    {
        var stop = stopping.Token;
        while (true)
        {
            lock (gate)
            {
                if (waiters == 0 || stop.IsCancellationRequested)
                {
                    polling = false;
                    return;
                }
            }

            try
            {
                await Task.Delay(interval, stop);
                Observe(await read(stop));
            }
            catch (OperationCanceledException) when (stop.IsCancellationRequested)
            {
                // The store is being disposed; the loop ends at the top.
            }
            catch (Exception ex)
            {
                // The waiters learn of it (an outage becomes their StorageUnavailableException); the loop goes on
                // for those who wait again.
                Fail(ex);
            }
        }
    }

    private void Fail(Exception exception)
    {
        TaskCompletionSource<ChangeToken> failed;
        lock (gate)
        {
            failed = next;
            next = NewSignal();
        }

        failed.TrySetException(exception);
    }

    private static TaskCompletionSource<ChangeToken> NewSignal() => new(TaskCreationOptions.RunContinuationsAsynchronously);
}
