using System.Globalization;

namespace CopyNumber.Cli.Rendering;

/// <summary>Number formatting for the console: invariant culture, significant digits, no exponent clutter.</summary>
internal static class Numbers
{
    public static string Format(double value, int significant = 4)
    {
        if (double.IsNaN(value)) return "-";
        if (double.IsInfinity(value)) return value > 0 ? "inf" : "-inf";
        if (value == 0) return "0";
        var magnitude = Math.Abs(value);
        if (magnitude is < 1e-3 or >= 1e9)
            return value.ToString(significant > 1 ? "0." + new string('#', significant - 1) + "e+0" : "0e+0", CultureInfo.InvariantCulture);
        // Round to the significant digits, then print in fixed notation (G would switch to E notation for 4.46e6).
        var decimals = significant - 1 - (int)Math.Floor(Math.Log10(magnitude));
        var rounded = decimals >= 0 ? Math.Round(value, Math.Min(decimals, 15)) : Math.Round(value / Math.Pow(10, -decimals)) * Math.Pow(10, -decimals);
        return rounded.ToString("0.###############", CultureInfo.InvariantCulture);
    }
}
