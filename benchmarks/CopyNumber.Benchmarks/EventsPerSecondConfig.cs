using BenchmarkDotNet.Columns;
using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Reports;
using BenchmarkDotNet.Running;

namespace CopyNumber.Benchmarks;

/// <summary>A benchmark whose invocation fires a known number of reaction events (or replicates, or rows).</summary>
public interface IEventCount
{
    /// <summary>Sets up for the current parameter values and returns what one invocation counts.</summary>
    long CountEvents();
}

/// <summary>
/// Adds the events fired per invocation and the resulting events per second to the summary table. The
/// count comes from a fresh instance of the benchmark class with the case's parameters, run once.
/// </summary>
public sealed class EventsPerSecondConfig : ManualConfig
{
    public EventsPerSecondConfig()
    {
        AddColumn(new EventsColumn(perSecond: false), new EventsColumn(perSecond: true));
    }

    private static readonly Dictionary<string, long> Counted = [];

    internal static long EventsOf(BenchmarkCase benchmarkCase)
    {
        var key = benchmarkCase.Descriptor.Type.FullName + "|" + benchmarkCase.Parameters.DisplayInfo;
        lock (Counted)
        {
            if (Counted.TryGetValue(key, out var known)) return known;
            var instance = (IEventCount)Activator.CreateInstance(benchmarkCase.Descriptor.Type)!;
            foreach (var parameter in benchmarkCase.Parameters.Items)
                benchmarkCase.Descriptor.Type.GetProperty(parameter.Name)!.SetValue(instance, parameter.Value);
            return Counted[key] = instance.CountEvents();
        }
    }

    private sealed class EventsColumn(bool perSecond) : IColumn
    {
        public string Id => perSecond ? "EventsPerSecond" : "Events";
        public string ColumnName => perSecond ? "Events/s" : "Events";
        public bool AlwaysShow => true;
        public ColumnCategory Category => ColumnCategory.Custom;
        public int PriorityInCategory => perSecond ? 1 : 0;
        public bool IsNumeric => true;
        public UnitType UnitType => UnitType.Dimensionless;
        public string Legend => perSecond ? "Events (or replicates, rows) per second of the invocation's threads" : "Events (or replicates, rows) in one invocation";
        public bool IsDefault(Summary summary, BenchmarkCase benchmarkCase) => false;
        public bool IsAvailable(Summary summary) => true;
        public string GetValue(Summary summary, BenchmarkCase benchmarkCase) => GetValue(summary, benchmarkCase, SummaryStyle.Default);

        public string GetValue(Summary summary, BenchmarkCase benchmarkCase, SummaryStyle style)
        {
            var events = EventsOf(benchmarkCase);
            if (!perSecond) return events.ToString("N0");
            var report = summary[benchmarkCase];
            var nanoseconds = report?.ResultStatistics?.Mean;
            return nanoseconds is > 0 ? (events / (nanoseconds.Value * 1e-9)).ToString("N0") : "-";
        }
    }
}
