using System.Globalization;

namespace CopyNumber.Cli.Rendering;

/// <summary>
/// The remaining-time estimate of the progress line: elapsed time scaled by the replicates still to run.
/// The estimate is computed in double seconds and saturates, because a run of 2^63 replicates is a valid
/// request whose estimate lies far beyond what <see cref="TimeSpan"/> can hold (the progress timer used to
/// throw there, and an exception on a timer thread ends the process).
/// </summary>
internal static class TimeLeft
{
    /// <summary>Estimates longer than this are printed as "more than 100 years": no digit beyond it means anything.</summary>
    public const double SaturationSeconds = 100 * 365.25 * 86400;

    /// <summary>"m:ss left", "h:mm:ss left", "N days left", "more than 100 years left" or "estimating".</summary>
    /// <param name="elapsedSeconds">Wall-clock seconds since the ensemble started.</param>
    /// <param name="done">Replicates finished so far.</param>
    /// <param name="total">Replicates this run will run in all.</param>
    public static string Describe(double elapsedSeconds, long done, long total)
    {
        if (done <= 0 || !(elapsedSeconds >= 0)) return "estimating";
        var left = elapsedSeconds * ((double)Math.Max(0, total - done) / done);
        if (!(left <= SaturationSeconds)) return "more than 100 years left";
        var seconds = (long)Math.Round(left);
        if (seconds >= 2 * 86400) return $"{(seconds / 86400).ToString(CultureInfo.InvariantCulture)} days left";
        if (seconds >= 3600) return $"{seconds / 3600}:{seconds / 60 % 60:00}:{seconds % 60:00} left";
        return $"{seconds / 60}:{seconds % 60:00} left";
    }
}
