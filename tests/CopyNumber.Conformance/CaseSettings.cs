using System.Globalization;

namespace CopyNumber.Conformance;

/// <summary>A test case's settings file (the SBML Test Suite's format, README-suite.md): grid, variables, tolerances, ranges.</summary>
internal sealed record CaseSettings(double Start, double Duration, int Steps, IReadOnlyList<string> Variables, double Absolute, double Relative,
    IReadOnlySet<string> Amounts, IReadOnlySet<string> Concentrations, (double Low, double High) MeanRange, (double Low, double High) SdRange)
{
    public static CaseSettings Read(string path)
    {
        var fields = File.ReadAllLines(path).Select(l => l.Split(':', 2)).Where(p => p.Length == 2)
            .ToDictionary(p => p[0].Trim(), p => p[1].Trim());
        string Field(string name) => fields.TryGetValue(name, out var v) ? v : "";
        double Real(string name, double absent) => double.TryParse(Field(name), NumberStyles.Float, CultureInfo.InvariantCulture, out var v) ? v : absent;
        IReadOnlyList<string> Names(string name) => Field(name).Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
        (double, double) Range(string name, double absent)
        {
            var parts = Field(name).Trim('(', ')', ' ').Split(',', StringSplitOptions.TrimEntries);
            return parts.Length == 2 ? (double.Parse(parts[0], CultureInfo.InvariantCulture), double.Parse(parts[1], CultureInfo.InvariantCulture)) : (-absent, absent);
        }
        return new CaseSettings(Real("start", 0), Real("duration", 0), (int)Real("steps", 0), Names("variables"), Real("absolute", 0), Real("relative", 0),
            Names("amount").ToHashSet(), Names("concentration").ToHashSet(), Range("meanRange", 3), Range("sdRange", 5));
    }
}

/// <summary>A results CSV: a header of names and one row of numbers per time.</summary>
internal sealed record ResultsTable(IReadOnlyList<string> Columns, IReadOnlyList<double[]> Rows)
{
    public static ResultsTable Read(string path)
    {
        var lines = File.ReadAllLines(path).Where(l => l.Trim().Length > 0).ToList();
        var columns = lines[0].Split(',').Select(c => c.Trim()).ToList();
        var rows = lines.Skip(1).Select(l => l.Split(',').Select(v => ParseValue(v.Trim())).ToArray()).ToList();
        return new ResultsTable(columns, rows);
    }

    private static double ParseValue(string v) => v.ToLowerInvariant() switch
    {
        "inf" or "+inf" or "infinity" => double.PositiveInfinity,
        "-inf" or "-infinity" => double.NegativeInfinity,
        "nan" => double.NaN,
        _ => double.Parse(v, NumberStyles.Float, CultureInfo.InvariantCulture),
    };

    public int Column(string name) => Columns.ToList().IndexOf(name);
}
