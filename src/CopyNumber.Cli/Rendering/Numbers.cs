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
        return magnitude is >= 1e-3 and < 1e7
            ? value.ToString("G" + significant, CultureInfo.InvariantCulture)
            : value.ToString((significant - 1) > 0 ? "0." + new string('#', significant - 1) + "e+0" : "0e+0", CultureInfo.InvariantCulture);
    }
}
