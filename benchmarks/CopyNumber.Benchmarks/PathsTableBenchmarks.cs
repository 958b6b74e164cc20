using BenchmarkDotNet.Attributes;
using CopyNumber.Network;
using CopyNumber.Storage;

namespace CopyNumber.Benchmarks;

/// <summary>
/// Rows per second written to paths.parquet through <see cref="PathsTable"/>: 1 000 replicates of the
/// promoter model's 4 species on a 201-point grid (201 000 rows of replicate, time and 4 counts), from
/// buffers filled once, to a file in the temporary folder. The Events column counts rows.
/// </summary>
[MemoryDiagnoser]
[Config(typeof(EventsPerSecondConfig))]
public class PathsTableBenchmarks : IEventCount
{
    private const int Replicates = 1_000;
    private static readonly TimeGrid Grid = new(200, 1);
    private ReactionNetwork _network = null!;
    private long[] _counts = null!;
    private string _path = "";

    [GlobalSetup]
    public void Setup()
    {
        _network = BenchmarkModels.Load("promoter_switch.cnet");
        var species = _network.Species.Count;
        _counts = new long[Grid.Count * species];
        for (var k = 0; k < _counts.Length; k++) _counts[k] = (k * 7919L) % 1000;
        _path = Path.Combine(Path.GetTempPath(), $"copynumber-paths-benchmark-{Environment.ProcessId}.parquet");
    }

    [Benchmark]
    public long WritePaths()
    {
        using var table = new PathsTable(_path, _network, Grid, new Dictionary<string, string>());
        for (var r = 0; r < Replicates; r++) table.Write(r, _counts, _network.Species.Count, Grid.Count);
        table.Complete();
        return table.Rows;
    }

    [GlobalCleanup]
    public void Cleanup() => File.Delete(_path);

    public long CountEvents() => (long)Replicates * Grid.Count;
}
