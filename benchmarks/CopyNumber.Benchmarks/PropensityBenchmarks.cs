using BenchmarkDotNet.Attributes;
using CopyNumber.Kinetics;

namespace CopyNumber.Benchmarks;

/// <summary>Evaluating every propensity of a bundled model once: the cost the simulators pay per full re-sum.</summary>
[MemoryDiagnoser]
public class PropensityBenchmarks
{
    private Propensities _propensities = null!;
    private long[] _counts = null!;
    private double[] _constants = null!;
    private double[] _parameters = null!;
    private double[] _into = null!;

    [Params("promoter_switch.cnet", "toggle_pair.cnet", "repressor_dimer.cnet")]
    public string Scenario { get; set; } = "";

    [GlobalSetup]
    public void Setup()
    {
        var network = BenchmarkModels.Load(Scenario);
        _propensities = network.Propensities;
        _counts = network.InitialCounts.Select(c => Math.Max(c, 7)).ToArray();
        _parameters = network.InitialParameterValues.ToArray();
        _constants = new double[_propensities.Count];
        _propensities.ComputeConstants(_parameters, _constants);
        _into = new double[_propensities.Count];
    }

    [Benchmark]
    public double EvaluateAll()
    {
        _propensities.EvaluateAll(_counts, _constants, _parameters, _into);
        return _into[0];
    }
}
