using System.Globalization;
using System.Text;
using ScottPlot;
using ScottPlot.TickGenerators;

namespace CopyNumber.Reports;

/// <summary>
/// Ticks for an axis whose data are log10-transformed: major ticks at whole decades labelled 10ⁿ, minor
/// ticks at 2…9 × 10ⁿ. When fewer than two decades fall inside the axis, 2 × and 5 × 10ⁿ are labelled
/// too, so the reader always has at least two numbers to read a scale from (common practice).
/// </summary>
internal static class LogTicks
{
    public static NumericManual For(double lowLog10, double highLog10) => new([.. Ticks(lowLog10, highLog10)]);

    /// <summary>The ticks inside [<paramref name="lowLog10"/>, <paramref name="highLog10"/>], positions in log10 units.</summary>
    public static List<Tick> Ticks(double lowLog10, double highLog10)
    {
        var ticks = new List<Tick>();
        int first = (int)Math.Floor(lowLog10), last = (int)Math.Ceiling(highLog10);
        int majorsInside = 0;
        for (int k = first; k <= last; k++)
            if (k >= lowLog10 && k <= highLog10) majorsInside++;
        bool labelMinors = majorsInside < 2;

        for (int k = first; k <= last; k++)
        {
            if (k >= lowLog10 && k <= highLog10) ticks.Add(Tick.Major(k, PowerOfTen(k)));
            for (int m = 2; m <= 9; m++)
            {
                double position = k + Math.Log10(m);
                if (position < lowLog10 || position > highLog10) continue;
                if (labelMinors && (m == 2 || m == 5)) ticks.Add(Tick.Major(position, $"{m}×{PowerOfTen(k)}"));
                else ticks.Add(Tick.Minor(position));
            }
        }
        return ticks;
    }

    /// <summary>"10" with the exponent in superscript digits, e.g. 10⁻³.</summary>
    public static string PowerOfTen(int exponent)
    {
        const string superscripts = "⁰¹²³⁴⁵⁶⁷⁸⁹";
        var text = new StringBuilder("10");
        if (exponent < 0) text.Append('⁻');
        foreach (char digit in Math.Abs(exponent).ToString(CultureInfo.InvariantCulture))
            text.Append(superscripts[digit - '0']);
        return text.ToString();
    }
}
