namespace CopyNumber.Reports;

/// <summary>
/// Splits an index range into maximal runs of usable points (typically: every value finite), so that a
/// line or band is drawn piece by piece and broken at missing values instead of bridging them.
/// </summary>
internal static class FiniteRuns
{
    public static List<(int Start, int Count)> Of(int length, Func<int, bool> usable)
    {
        var runs = new List<(int, int)>();
        int start = -1;
        for (int i = 0; i <= length; i++)
        {
            bool ok = i < length && usable(i);
            if (ok && start < 0) start = i;
            else if (!ok && start >= 0)
            {
                runs.Add((start, i - start));
                start = -1;
            }
        }
        return runs;
    }

    public static double[] Slice(double[] values, (int Start, int Count) run) => values.AsSpan(run.Start, run.Count).ToArray();

    public static bool Finite(params ReadOnlySpan<double> values)
    {
        foreach (double v in values)
            if (!double.IsFinite(v)) return false;
        return true;
    }
}
