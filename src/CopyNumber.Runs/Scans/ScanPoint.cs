using System.Globalization;

namespace CopyNumber.Runs.Scans;

/// <summary>One point of a scan: its number (from 0, in design order) and one value per axis, in axis order.</summary>
public sealed record ScanPoint(int Index, IReadOnlyList<double> Values)
{
    /// <summary>The point's run folder name inside the scan folder, e.g. <c>point-0007</c>.</summary>
    public string FolderName => Storage.RunFiles.ScanPointPrefix + Index.ToString("D4", CultureInfo.InvariantCulture);
}
