using System.Globalization;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// The one way numbers are written in verdict sentences: at most three significant digits, never in
/// exponent notation, and a value whose magnitude is below its resolution (a confidence half-width, the
/// solver tolerance, one replicate in n) is written "0", without a sign, so that round-off never shows as
/// "−7.4E-06%".
/// </summary>
public static class VerdictText
{
    /// <summary>A relative magnitude below this is round-off whatever the caller's resolution (the rate equations' default relative tolerance is 10⁻⁶).</summary>
    public const double RelativeRoundOff = 1e-6;

    /// <summary>A time, with up to six significant digits.</summary>
    public static string Time(double t) => Fixed(t, 6);

    /// <summary>A number with three significant digits (integers from 100 up), or "0" below <paramref name="resolution"/>.</summary>
    /// <param name="x">The value.</param>
    /// <param name="resolution">The smallest magnitude that means something, ≥ 0; 0 means only exact 0 prints as 0.</param>
    public static string Number(double x, double resolution = 0)
    {
        if (double.IsNaN(x)) return "undefined";
        if (double.IsInfinity(x)) return x > 0 ? "∞" : "−∞";
        if (IsBelow(x, resolution)) return "0";
        var text = Math.Abs(x) >= 100 ? Math.Round(x).ToString("0", CultureInfo.InvariantCulture) : Fixed(x, 3);
        return Minus(text);
    }

    /// <summary>A fraction as a percentage (15%, 2.5%, 0.42%), or "0%" below <paramref name="resolution"/> (a fraction, not a percentage).</summary>
    public static string Percent(double fraction, double resolution = 0)
    {
        if (double.IsNaN(fraction)) return "undefined";
        if (IsBelow(fraction, Math.Max(resolution, RelativeRoundOff))) return "0%";
        var p = 100 * fraction;
        var text = Math.Abs(p) >= 10 ? Math.Round(p).ToString("0", CultureInfo.InvariantCulture)
            : Math.Abs(p) >= 1 ? Math.Round(p, 1).ToString("0.#", CultureInfo.InvariantCulture)
            : Fixed(p, 2);
        return Minus(text) + "%";
    }

    /// <summary>A confidence level as a percentage with the digits it needs ("99%", "99.5%").</summary>
    public static string Level(double probability) => Math.Round(100 * probability, 2).ToString("0.##", CultureInfo.InvariantCulture) + "%";

    /// <summary>"1 grid time", "26 grid times".</summary>
    public static string Count(long n, string singular, string plural) => $"{n} {(n == 1 ? singular : plural)}";

    /// <summary>A signed percentage ("+14%", "−3%"); no sign when it prints as 0.</summary>
    public static string SignedPercent(double fraction, double resolution = 0)
    {
        var text = Percent(Math.Abs(fraction), resolution);
        return text == "0%" ? text : (fraction < 0 ? "−" : "+") + text;
    }

    /// <summary>A signed number ("+3.2", "−41"); no sign when it prints as 0.</summary>
    public static string SignedNumber(double x, double resolution = 0)
    {
        var text = Number(Math.Abs(x), resolution);
        return text == "0" ? text : (x < 0 ? "−" : "+") + text;
    }

    private static bool IsBelow(double x, double resolution) => x == 0 || Math.Abs(x) < resolution;

    // Rounds to the given significant digits and writes it in fixed notation, trailing zeros dropped.
    private static string Fixed(double x, int digits)
    {
        if (x == 0) return "0";
        var magnitude = (int)Math.Floor(Math.Log10(Math.Abs(x)));
        var decimals = Math.Clamp(digits - 1 - magnitude, 0, 15);
        var rounded = Math.Round(x, decimals);
        if (rounded == 0) return "0";
        return rounded.ToString("0." + new string('#', Math.Max(decimals, 1)), CultureInfo.InvariantCulture);
    }

    private static string Minus(string text) => text.StartsWith('-') ? "−" + text[1..] : text;
}
