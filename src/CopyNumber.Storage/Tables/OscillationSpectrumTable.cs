using CopyNumber.Analysis.Oscillation;

namespace CopyNumber.Storage;

/// <summary>
/// <c>oscillation-spectrum.parquet</c>: one row per (species, frequency) of the oscillation sample's averaged spectrum
/// (docs/methods-analysis.md, section 7). Columns: <c>species</c>, <c>omega</c> (radians per time unit), <c>power</c> and
/// <c>power_error</c> (the replicates' mean periodogram and its standard error, copies² × time, two-sided), <c>lna_power</c>
/// (the LNA spectrum at a stable steady state; NaN on a limit cycle), <c>lag</c> and <c>autocorrelation</c> (the averaged
/// autocorrelation at lag = row index × step, NaN beyond its last lag).
/// </summary>
public static class OscillationSpectrumTable
{
    /// <summary>Column names, in file order.</summary>
    public static readonly IReadOnlyList<string> ColumnNames = ["species", "omega", "power", "power_error", "lna_power", "lag", "autocorrelation"];

    /// <summary>Writes the table of <paramref name="oscillation"/>'s species.</summary>
    public static void Write(string path, RunOscillation oscillation, IReadOnlyDictionary<string, string> metadata)
    {
        ArgumentNullException.ThrowIfNull(oscillation);
        var columns = ColumnNames.Select(n => new ColumnSpec(n, n == "species" ? ColumnType.String : ColumnType.Double)).ToArray();
        using var writer = ParquetTableWriter.Create(path, columns, metadata);
        foreach (var s in oscillation.Species)
        {
            var spectrum = s.Spectrum;
            var rows = spectrum.Frequencies.Length;
            double At(double[] values, int k) => k < values.Length ? values[k] : double.NaN;
            writer.WriteRowGroup([
                Enumerable.Repeat(s.Species, rows).ToArray(),
                spectrum.Frequencies,
                spectrum.Power,
                spectrum.PowerError,
                s.LnaPower ?? Enumerable.Repeat(double.NaN, rows).ToArray(),
                Enumerable.Range(0, rows).Select(k => At(spectrum.Lags, k)).ToArray(),
                Enumerable.Range(0, rows).Select(k => At(spectrum.Autocorrelation, k)).ToArray(),
            ]);
        }
        writer.Complete();
    }
}
