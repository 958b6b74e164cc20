using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Runs.Scans;

/// <summary>What a varied name stands for in the model.</summary>
public enum ScanTarget
{
    /// <summary>A parameter: its defining expression is replaced by the value.</summary>
    Parameter,

    /// <summary>The system size Ω (<c>size</c>): the model is compiled at it (initial counts scaled by Ω/Ω₀).</summary>
    Size,

    /// <summary>A species' initial count (a whole number of copies).</summary>
    InitialCount,
}

/// <summary>A range written <c>lo:hi:lin|log:count</c>: <c>count</c> values from lo to hi inclusive, evenly spaced in the value or in its logarithm.</summary>
public sealed record ScanRange(double Low, double High, bool Logarithmic, int Count)
{
    /// <summary>The value at fraction u ∈ [0, 1] of the range (in log space for a logarithmic range).</summary>
    /// <remarks>Rounded to 12 significant digits, so that 5·2^(1/2)·2^(1/2) reads 10 and not 9.999999999999998.</remarks>
    public double At(double u) => Significant(Logarithmic
        ? Math.Exp(Math.Log(Low) + u * (Math.Log(High) - Math.Log(Low)))
        : Low + u * (High - Low));

    private static double Significant(double value)
    {
        if (value == 0 || !double.IsFinite(value)) return value;
        // Divide an integer by an exact power of ten (10^k is exact for k ≤ 22), so the result is the double nearest the decimal.
        var k = 11 - (int)Math.Floor(Math.Log10(Math.Abs(value)));
        return k is >= 0 and <= 22 ? Math.Round(value * Math.Pow(10, k)) / Math.Pow(10, k)
            : k < 0 && -k <= 22 ? Math.Round(value / Math.Pow(10, -k)) * Math.Pow(10, -k)
            : value;
    }

    /// <summary>The <see cref="Count"/> grid values, ends exact.</summary>
    public double[] Values() => Count == 1 ? [Low]
        : Enumerable.Range(0, Count).Select(i => i == Count - 1 ? High : i == 0 ? Low : At(i / (double)(Count - 1))).ToArray();
}

/// <summary>
/// One varied name of a scan, from <c>--vary NAME=SPEC</c>. SPEC is a list <c>1,2,5</c> or a range
/// <c>lo:hi:lin:count</c> / <c>lo:hi:log:count</c> (docs/methods-analysis.md, "Scans").
/// </summary>
/// <param name="Name">A parameter, <c>size</c>, or a species (its initial count).</param>
/// <param name="Target">What the name stands for.</param>
/// <param name="Values">The values of a full grid along this axis, ascending, distinct.</param>
/// <param name="Range">The range when SPEC was one (a Latin hypercube draws within it); null for a list.</param>
/// <param name="Spec">The option's text as given, for the scan's record.</param>
public sealed record ScanAxis(string Name, ScanTarget Target, IReadOnlyList<double> Values, ScanRange? Range, string Spec)
{
    /// <summary>Most values on one axis.</summary>
    public const int MaximumValues = 10_000;

    /// <summary>Reads <c>NAME=SPEC</c> against <paramref name="network"/>.</summary>
    /// <exception cref="ScanInputException">The text does not read, or the name is not in the model.</exception>
    public static ScanAxis Parse(string text, ReactionNetwork network)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(network);
        var equals = text.IndexOf('=', StringComparison.Ordinal);
        if (equals <= 0 || equals == text.Length - 1)
            throw new ScanInputException($"--vary takes NAME=SPEC, e.g. k=1,2,5 or k=0.1:10:log:9 (got '{text}')");
        var name = text[..equals].Trim();
        var spec = text[(equals + 1)..].Trim();
        var target = name == "size" ? ScanTarget.Size
            : network.ParameterIndex(name) >= 0 ? ScanTarget.Parameter
            : network.SpeciesIndex(name) >= 0 ? ScanTarget.InitialCount
            : throw new ScanInputException($"--vary {name}: the model has no parameter or species '{name}' (it varies a parameter, a species' initial count, or size)");
        var range = spec.Contains(':', StringComparison.Ordinal) ? ReadRange(name, spec) : null;
        var values = range?.Values() ?? ReadList(name, spec);
        if (target != ScanTarget.Parameter && values.Any(v => !(v > 0) && !(target == ScanTarget.InitialCount && v == 0)))
            throw new ScanInputException($"--vary {name}: {(target == ScanTarget.Size ? "a size must be positive" : "an initial count cannot be negative")}");
        if (target == ScanTarget.InitialCount && values.Any(v => v != Math.Round(v) || v > 9.007199254740992e15))
            throw new ScanInputException($"--vary {name}: an initial count is a whole number of copies (got {string.Join(", ", values.Where(v => v != Math.Round(v)).Take(3).Select(Format))}); use a list or a range whose values are whole");
        var sorted = values.Distinct().Order().ToArray();
        return new ScanAxis(name, target, sorted, range, spec);
    }

    /// <summary>The value as the scan writes it (shortest round-trip form).</summary>
    public static string Format(double value) => value.ToString("R", CultureInfo.InvariantCulture);

    private static ScanRange ReadRange(string name, string spec)
    {
        var parts = spec.Split(':');
        if (parts.Length != 4 || !TryReal(parts[0], out var low) || !TryReal(parts[1], out var high) || parts[2] is not ("lin" or "log")
            || !int.TryParse(parts[3], NumberStyles.None, CultureInfo.InvariantCulture, out var count))
            throw new ScanInputException($"--vary {name}: a range is lo:hi:lin:count or lo:hi:log:count, e.g. 0.1:10:log:9 (got '{spec}')");
        var log = parts[2] == "log";
        if (!(low < high)) throw new ScanInputException($"--vary {name}: the range's low end must be below its high end (got {parts[0]} and {parts[1]})");
        if (log && !(low > 0)) throw new ScanInputException($"--vary {name}: a logarithmic range needs a positive low end (got {parts[0]})");
        if (count < 2 || count > MaximumValues) throw new ScanInputException($"--vary {name}: a range needs between 2 and {MaximumValues} values (got {count})");
        return new ScanRange(low, high, log, count);
    }

    private static double[] ReadList(string name, string spec)
    {
        var parts = spec.Split(',', StringSplitOptions.TrimEntries);
        if (parts.Length > MaximumValues) throw new ScanInputException($"--vary {name}: at most {MaximumValues} values");
        var values = new double[parts.Length];
        for (var i = 0; i < parts.Length; i++)
            if (!TryReal(parts[i], out values[i]))
                throw new ScanInputException($"--vary {name}: '{parts[i]}' is not a finite number (a list is 1,2,5; a range lo:hi:lin|log:count)");
        return values;
    }

    private static bool TryReal(string text, out double value) =>
        double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out value) && double.IsFinite(value);
}
