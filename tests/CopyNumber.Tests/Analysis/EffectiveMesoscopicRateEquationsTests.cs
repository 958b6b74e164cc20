using CopyNumber.Analysis;
using CopyNumber.Network;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.OdeSolvers;
using static CopyNumber.Tests.Analysis.AnalysisModels;

namespace CopyNumber.Tests.Analysis;

/// <summary>
/// The first-order mean correction (EMRE; Grima 2010, J. Chem. Phys. 133:035101) against the exact mean
/// of the chemical master equation, computed here on a truncated state space. Grima shows the EMRE mean
/// concentration is accurate to O(Ω⁻²); in copy numbers (×Ω) its error is O(1/Ω), while the rate
/// equations' error stays O(1) in copies. The tests check exactly that: the correction predicts the
/// sign and size of the rate equations' deviation, and its own error falls like 1/Ω.
/// </summary>
public sealed class EffectiveMesoscopicRateEquationsTests
{
    private static ReactionNetwork PairAnnihilation(double size) => Compile($"""
        size {size}
        species
          A = 0
        reactions
          inflow: 0 -> A mass 5
          pair: 2 A -> 0 mass 0.1
        """);

    // Stationary CME of 0 -> A (propensity j·Ω), 2A -> 0 (propensity (k/Ω)·n(n − 1)) on {0, …, nmax}:
    // Q·p = 0 with one row replaced by Σp = 1, solved densely with MathNet (the chemical master equation,
    // Gillespie 1992, Physica A 188:404; truncation common practice, its tail mass is checked).
    private static double[] PairAnnihilationStationary(double size, int nmax)
    {
        double birth = 5 * size, pair = 0.1 / size;
        var q = Matrix<double>.Build.Dense(nmax + 1, nmax + 1);
        for (var n = 0; n <= nmax; n++)
        {
            if (n < nmax) { q[n + 1, n] += birth; q[n, n] -= birth; }
            if (n >= 2) { var r = pair * n * (n - 1.0); q[n - 2, n] += r; q[n, n] -= r; }
        }
        for (var n = 0; n <= nmax; n++) q[0, n] = 1;
        var rhs = Vector<double>.Build.Dense(nmax + 1);
        rhs[0] = 1;
        var p = q.Solve(rhs).ToArray();
        Assert.True(p[nmax] < 1e-30, $"truncation tail {p[nmax]}");
        return p;
    }

    private static double Mean(double[] p) => p.Select((pn, n) => n * pn).Sum();

    [Fact]
    public void PairAnnihilationWithInflowMatchesTheMasterEquationToOrderOneOverSize()
    {
        var errors = new List<double>();
        foreach (var size in new[] { 1.0, 4.0 })
        {
            var solution = EffectiveMesoscopicRateEquations.Solve(PairAnnihilation(size), new TimeGrid(200, 200), Tight);
            var last = solution.Grid.Count - 1;
            var phi = solution.RateEquationValue(last, 0);
            var corrected = solution.CorrectedMean(last, 0);
            var exact = Mean(PairAnnihilationStationary(size, (int)(60 * size + 100)));

            // Rate equations: j·Ω = 2·(k/Ω)·φ², φ = Ω·√(j/2k) = 5Ω (exact algebra).
            Assert.Equal(5 * size, phi, 1e-7 * size);
            // The master equation's mean lies above the rate equations (pairs need two molecules) by
            // about 1/8 copy, and the correction predicts the sign and, to within 10%, the size.
            var shift = exact - phi;
            Assert.True(shift > 0.1 && shift < 0.15, $"CME − RE = {shift}");
            Assert.True(Math.Abs((corrected - phi) - shift) < 0.1 * shift, $"EMRE shift {corrected - phi}, CME shift {shift}");
            errors.Add(Math.Abs(corrected - exact));

            // The stationary EMRE solved by hand from the stated equations: J_a = −2(k/Ω)(2φ − 1),
            // source N·[(a − v) + ½·a''·C] = 2(k/Ω)(φ − C) with the LNA's C = 3φ/4, so δ = φ/(4(2φ − 1)).
            Assert.Equal(0.75 * phi, solution.Variance(last, 0), 1e-7 * phi);
            Assert.Equal(phi / (4 * (2 * phi - 1)), corrected - phi, 1e-8);
        }
        // O(1/Ω) in copies: quadrupling Ω divides the error by about 4 (0.3 leaves room for the O(1/Ω²) rest).
        Assert.True(errors[1] < 0.3 * errors[0], $"errors {errors[0]} at Ω = 1, {errors[1]} at Ω = 4");
    }

    [Fact]
    public void PairAnnihilationTransientFollowsTheTimeDependentMasterEquation()
    {
        // The master equation integrated in time from p(0) = δ_{n,0} by MathNet's classical Runge–Kutta
        // (fixed step 10⁻³, far below the fastest rate's inverse): the corrected mean must be closer to its
        // mean than the rate equations are, at every time after the start.
        const double size = 2;
        const int nmax = 120;
        double birth = 5 * size, pair = 0.1 / size;
        Vector<double> Generator(double t, Vector<double> p)
        {
            var dp = Vector<double>.Build.Dense(nmax + 1);
            for (var n = 0; n <= nmax; n++)
            {
                if (n < nmax) { dp[n + 1] += birth * p[n]; dp[n] -= birth * p[n]; }
                if (n >= 2) { var r = pair * n * (n - 1.0) * p[n]; dp[n - 2] += r; dp[n] -= r; }
            }
            return dp;
        }
        var p0 = Vector<double>.Build.Dense(nmax + 1);
        p0[0] = 1;
        var grid = new TimeGrid(4, 0.5);
        var trajectory = RungeKutta.FourthOrder(p0, 0, grid.Until, 4001, Generator);
        var solution = EffectiveMesoscopicRateEquations.Solve(PairAnnihilation(size), grid, Tight);
        for (var k = 1; k < grid.Count; k++)
        {
            var p = trajectory[(int)Math.Round(grid[k] / grid.Until * 4000)];
            var exact = p.Select((pn, n) => n * pn).Sum();
            var reError = Math.Abs(solution.RateEquationValue(k, 0) - exact);
            var emreError = Math.Abs(solution.CorrectedMean(k, 0) - exact);
            Assert.True(emreError < 0.25 * reError, $"t = {grid[k]}: RE error {reError}, EMRE error {emreError}");
        }
    }

    [Fact]
    public void ClosedDimerisationMatchesTheMasterEquationAndKeepsItsConservationLaw()
    {
        // 2A <-> B with A + 2B = n_T: a one-step process in B, whose stationary law is the product
        // p(b)/p(b − 1) = c₁·a(a − 1)/(c₂·b) with a = n_T − 2(b − 1) (detailed balance; van Kampen 2007, ch. VI).
        var errors = new List<double>();
        foreach (var size in new[] { 1.0, 4.0 })
        {
            var total = (long)(40 * size);
            var network = Compile($"""
                size {size}
                species
                  A = {total}
                  B = 0
                reactions
                  dimer: 2 A -> B mass 0.05  back mass 1
                readouts
                  monomers = A + 2*B
                """);
            var solution = EffectiveMesoscopicRateEquations.Solve(network, new TimeGrid(100, 100), Tight);
            var last = solution.Grid.Count - 1;

            var log = new double[total / 2 + 1];
            for (var b = 1; b < log.Length; b++)
            {
                double a = total - 2 * (b - 1);
                log[b] = log[b - 1] + Math.Log(0.05 / size * a * (a - 1)) - Math.Log(b);
            }
            var top = log.Max();
            var weights = log.Select(l => Math.Exp(l - top)).ToArray();
            var exactA = weights.Select((w, b) => (total - 2.0 * b) * w).Sum() / weights.Sum();

            var shift = exactA - solution.RateEquationValue(last, 0);
            Assert.True(shift > 0.05, $"CME − RE = {shift}");
            Assert.True(Math.Abs(solution.CorrectedMean(last, 0) - solution.RateEquationValue(last, 0) - shift) < 0.1 * shift);
            errors.Add(Math.Abs(solution.CorrectedMean(last, 0) - exactA));
            // δ lies in the range of N, so the corrected means keep A + 2B = n_T, and its variance is 0.
            var monomers = solution.ColumnIndex("monomers");
            Assert.Equal(total, solution.CorrectedMean(last, monomers), 1e-7 * total);
            Assert.Equal(0.0, solution.Variance(last, monomers), 1e-6 * total);
        }
        Assert.True(errors[1] < 0.3 * errors[0], $"errors {errors[0]} at Ω = 1, {errors[1]} at Ω = 4");
    }

    [Fact]
    public void RepressedSynthesisRateLawUsesDifferencedSecondDerivatives()
    {
        // Birth with a Hill-repressed rate law Ω·v·K²/(K² + (n/Ω)²), first-order death: a one-step
        // process with stationary law p(n)/p(n − 1) = λ(n − 1)/(d·n) (van Kampen 2007, ch. VI). The rate
        // law is its own propensity, so the whole correction comes from its second derivative.
        var errors = new List<double>();
        foreach (var size in new[] { 1.0, 4.0 })
        {
            var network = Compile($"""
                size {size}
                species
                  A = 0
                parameters
                  v = 20
                  K = 5
                reactions
                  make: 0 -> A rate size * v * hill_rep(A / size, K, 2)
                  decay: A -> 0 mass 1
                """);
            var solution = EffectiveMesoscopicRateEquations.Solve(network, new TimeGrid(60, 60), Tight);
            var last = solution.Grid.Count - 1;
            var nmax = (int)(40 * size + 200);
            var log = new double[nmax + 1];
            for (var n = 1; n <= nmax; n++)
            {
                var x = (n - 1) / size;
                log[n] = log[n - 1] + Math.Log(size * 20 * 25 / (25 + x * x)) - Math.Log(n);
            }
            var top = log.Max();
            var weights = log.Select(l => Math.Exp(l - top)).ToArray();
            var exact = weights.Select((w, n) => n * w).Sum() / weights.Sum();

            var shift = exact - solution.RateEquationValue(last, 0);
            Assert.True(shift > 0.1, $"CME − RE = {shift}");
            Assert.True(Math.Abs(solution.CorrectedMean(last, 0) - solution.RateEquationValue(last, 0) - shift) < 0.1 * shift);
            errors.Add(Math.Abs(solution.CorrectedMean(last, 0) - exact));
        }
        Assert.True(errors[1] < 0.3 * errors[0], $"errors {errors[0]} at Ω = 1, {errors[1]} at Ω = 4");
    }

    [Fact]
    public void LinearNetworksNeedNoCorrection()
    {
        // With propensities linear in the counts, d⟨x⟩/dt = N·a(⟨x⟩) exactly: the rate equations give the
        // exact mean and δ stays 0 (van Kampen 2007, ch. X; common practice), also across a schedule jump.
        var network = Compile("""
            species
              M = 3
              P = 0
            reactions
              transcription: 0 -> M mass 0.5
              mrna_decay: M -> 0 mass 0.25
              translation: M -> M + P mass 2
              protein_decay: P -> 0 mass 0.05
            changes
              P += 7  at time 4
            """);
        var solution = EffectiveMesoscopicRateEquations.Solve(network, new TimeGrid(10, 0.5), Tight);
        Assert.True(solution.HasMeanCorrection);
        for (var k = 0; k < solution.Grid.Count; k++)
            for (var i = 0; i < 2; i++)
            {
                Assert.Equal(0.0, solution.MeanCorrection(k)[i], 1e-9);
                Assert.Equal(solution.RateEquationValue(k, i), solution.CorrectedMean(k, i), 1e-9);
            }
    }
}
