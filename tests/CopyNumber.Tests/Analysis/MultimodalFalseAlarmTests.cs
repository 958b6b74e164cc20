using CopyNumber.Analysis;
using CopyNumber.Randomness;
using MathNet.Numerics;
using Xunit.Abstractions;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// The false-alarm rate of the verdict "multimodal", measured: Poisson and binomial laws are unimodal for
/// every parameter (discrete log-concave; Keilson &amp; Gerber 1971, J. Am. Stat. Assoc. 66:386; quoted from
/// memory), so every "multimodal" on them is a false alarm. Each run is a grid of many times at each of
/// which a histogram of n replicates is drawn from the law (multinomially, <see cref="LawSampling"/>,
/// fixed seeds); 200 runs per law and sample size. The verdict's documented rate is ≤ 1% per
/// quantity and run; the check allows the binomial sampling error of a rate measured over 200 runs.
/// </summary>
public sealed class MultimodalFalseAlarmTests(ITestOutputHelper output)
{
    private const int Runs = 200;
    private const int GridTimes = 51;

    // (name, lower end of the support, log-probabilities from there on)
    public static TheoryData<string> Laws() => new() { "Poisson(2)", "Poisson(30)", "Poisson(500)", "Poisson(10000)", "Binomial(4, 0.5)", "Binomial(100, 0.3)", "Binomial(625, 0.8)", "Binomial(12500, 0.8)" };

    private static (long From, double[] Probabilities) Law(string name)
    {
        var open = name.IndexOf('(');
        var arguments = name[(open + 1)..^1].Split(", ").Select(double.Parse).ToArray();
        long from, to;
        Func<long, double> logPmf;
        if (name.StartsWith("Poisson", StringComparison.Ordinal))
        {
            var mean = arguments[0];
            var sd = Math.Sqrt(mean);
            from = Math.Max(0, (long)(mean - 12 * sd - 5));
            to = (long)(mean + 12 * sd + 10);
            logPmf = k => k * Math.Log(mean) - mean - SpecialFunctions.GammaLn(k + 1);
        }
        else
        {
            var trials = (int)arguments[0];
            var p = arguments[1];
            var sd = Math.Sqrt(trials * p * (1 - p));
            from = Math.Max(0, (long)(trials * p - 12 * sd - 5));
            to = Math.Min(trials, (long)(trials * p + 12 * sd + 5));
            logPmf = k => SpecialFunctions.BinomialLn(trials, (int)k) + k * Math.Log(p) + (trials - k) * Math.Log(1 - p);
        }
        var probabilities = Enumerable.Range(0, (int)(to - from + 1)).Select(i => Math.Exp(logPmf(from + i))).ToArray();
        var sum = probabilities.Sum();
        return (from, probabilities.Select(q => q / sum).ToArray());
    }

    // The largest number of alarms in `runs` runs that is still consistent, at the one-sided level 0.001,
    // with a true rate of `rate`: the 99.9% quantile of Binomial(runs, rate) (common practice).
    private static int Allowance(int runs, double rate)
    {
        var k = 0;
        while (MathNet.Numerics.Distributions.Binomial.CDF(rate, runs, k) < 0.999) k++;
        return k;
    }

    [Theory]
    [MemberData(nameof(Laws))]
    public void Multimodal_is_a_false_alarm_in_at_most_one_run_in_a_hundred(string law)
    {
        var (from, probabilities) = Law(law);
        var values = LawSampling.Consecutive(from, probabilities.Length);
        var lawMean = probabilities.Select((q, i) => q * (from + i)).Sum();
        var lawVariance = probabilities.Select((q, i) => q * (from + i - lawMean) * (from + i - lawMean)).Sum();
        var alarms = 0;
        var timesWithTwoModes = 0L;
        foreach (var n in new[] { 100, 1000, 10000 })
        {
            var alarmsAtN = 0;
            var sampledMean = 0.0;
            for (var run = 0; run < Runs; run++)
            {
                var rng = new Xoshiro256StarStar((ulong)(1_000_003 * run + n + 17 * law.Length));
                var points = new List<ContrastPoint>(GridTimes);
                for (var k = 0; k < GridTimes; k++)
                {
                    var histogram = LawSampling.Sample(ref rng, values, probabilities, n);
                    var mean = histogram.Mean;
                    var variance = histogram.Variance * n / (n - 1.0);
                    points.Add(new ContrastPoint(k, n, mean, variance, Math.Sqrt(variance / n), histogram.ProbabilityOfZero, histogram, mean));
                    sampledMean += mean / (Runs * GridTimes);
                }
                var contrast = Contrast.Analyze("X", points);
                timesWithTwoModes += contrast.MultimodalTimes.Count;
                if (contrast.Verdicts.Any(v => v.Kind == VerdictKind.Multimodal)) alarmsAtN++;
            }
            output.WriteLine($"{law}, n = {n}: 'multimodal' in {alarmsAtN} of {Runs} runs");
            // The sampler itself: the grand mean of Runs·GridTimes·n draws within 5 standard errors of the law's.
            var se = Math.Sqrt(lawVariance / ((double)Runs * GridTimes * n));
            Assert.InRange(sampledMean, lawMean - 5 * se, lawMean + 5 * se);
            Assert.True(alarmsAtN <= Allowance(Runs, 0.01), $"{law}, n = {n}: 'multimodal' in {alarmsAtN} of {Runs} runs; at most {Allowance(Runs, 0.01)} allowed for a 1% rate");
            alarms += alarmsAtN;
        }
        output.WriteLine($"{law}: {alarms} of {3 * Runs} runs; ≥ 2 modes at {timesWithTwoModes} of {3L * Runs * GridTimes} grid times");
    }
}
