using BenchmarkDotNet.Columns;
using BenchmarkDotNet.Configs;
using BenchmarkDotNet.Reports;
using BenchmarkDotNet.Running;
using CopyNumber.Stochastic;

namespace CopyNumber.Benchmarks;

/// <summary>Adds the events fired per invocation and the resulting events per second to the summary table.</summary>
public sealed class EventsPerSecondConfig : ManualConfig
{
    public EventsPerSecondConfig()
    {
        AddColumn(new EventsColumn(perSecond: false), new EventsColumn(perSecond: true));
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
        public string Legend => perSecond ? "Reaction events per second of one thread" : "Reaction events fired by one invocation";
        public bool IsDefault(Summary summary, BenchmarkCase benchmarkCase) => false;
        public bool IsAvailable(Summary summary) => true;
        public string GetValue(Summary summary, BenchmarkCase benchmarkCase) => GetValue(summary, benchmarkCase, SummaryStyle.Default);

        public string GetValue(Summary summary, BenchmarkCase benchmarkCase, SummaryStyle style)
        {
            var parameters = benchmarkCase.Parameters;
            var events = SimulatorBenchmarks.EventsOf((string)parameters["Scenario"], (SimulationMethod)parameters["Method"], (double)parameters["Until"]);
            if (!perSecond) return events.ToString("N0");
            var report = summary[benchmarkCase];
            var nanoseconds = report?.ResultStatistics?.Mean;
            return nanoseconds is > 0 ? (events / (nanoseconds.Value * 1e-9)).ToString("N0") : "-";
        }
    }
}
