namespace CopyNumber.Deterministic;

/// <summary>
/// Step-size selection shared by both methods. The accepted-step rule is the PI controller of
/// Gustafsson (1991, ACM Trans. Math. Softw. 17:533) in the form of Hairer, Nørsett &amp; Wanner
/// (Solving ODEs I, 2nd ed., Sect. II.4): h_new = h·err^(−α)·err_prev^β/safety-bounded, with
/// α = 1/k − 0.75β, β = 0.2/k and k the embedded estimate's order plus one, which reproduces the
/// DOPRI5 defaults α = 0.17, β = 0.04 for k = 5. A rejected step uses the elementary rule err^(−1/k),
/// and the step after a rejection may not grow (H&amp;W I, II.4).
/// </summary>
internal sealed class StepSizeController
{
    private const double Safety = 0.9;
    private readonly double _alpha;
    private readonly double _beta;
    private readonly double _rejectExponent;
    private readonly double _minFactor;
    private readonly double _maxFactor;
    private double _previousError;
    private bool _lastRejected;

    /// <param name="k">Order of the embedded error estimate plus one.</param>
    /// <param name="minFactor">Smallest ratio h_new/h.</param>
    /// <param name="maxFactor">Largest ratio h_new/h.</param>
    public StepSizeController(int k, double minFactor, double maxFactor)
    {
        _beta = 0.2 / k;
        _alpha = 1.0 / k - 0.75 * _beta;
        _rejectExponent = 1.0 / k;
        _minFactor = minFactor;
        _maxFactor = maxFactor;
        Reset();
    }

    /// <summary>Forgets the error history (after a restart or a method switch).</summary>
    public void Reset()
    {
        _previousError = 1e-4;
        _lastRejected = false;
    }

    /// <summary>The next step after accepting a step of size <paramref name="h"/> with scaled error <paramref name="error"/> ≤ 1.</summary>
    public double Accepted(double h, double error)
    {
        var e = Math.Max(error, 1e-10);
        var factor = Safety * Math.Pow(e, -_alpha) * Math.Pow(_previousError, _beta);
        factor = Math.Clamp(factor, _minFactor, _maxFactor);
        if (_lastRejected) factor = Math.Min(factor, 1.0);
        _previousError = Math.Max(error, 1e-4);
        _lastRejected = false;
        return h * factor;
    }

    /// <summary>The retry after rejecting a step of size <paramref name="h"/> with scaled error <paramref name="error"/> &gt; 1 (possibly +∞).</summary>
    public double Rejected(double h, double error)
    {
        _lastRejected = true;
        var factor = double.IsFinite(error) ? Safety * Math.Pow(error, -_rejectExponent) : _minFactor;
        return h * Math.Clamp(factor, _minFactor, 1.0);
    }
}

/// <summary>
/// The weighted root-mean-square norm of Hairer, Nørsett &amp; Wanner (Solving ODEs I, eq. II.4.11):
/// sqrt(1/n Σ (e_i / (atol + rtol·max(|y_i|, |ŷ_i|)))²). A non-finite trial yields +∞ so the step is rejected.
/// </summary>
internal static class ErrorNorm
{
    public static double Scaled(double[] error, double[] y, double[] yNew, double rtol, double atol)
    {
        var sum = 0.0;
        for (var i = 0; i < error.Length; i++)
        {
            if (!double.IsFinite(yNew[i]) || !double.IsFinite(error[i])) return double.PositiveInfinity;
            var scale = atol + rtol * Math.Max(Math.Abs(y[i]), Math.Abs(yNew[i]));
            if (error[i] == 0) continue; // also covers 0/0 under a purely relative tolerance
            var r = error[i] / scale;
            sum += r * r;
        }
        var norm = error.Length == 0 ? 0.0 : Math.Sqrt(sum / error.Length);
        return double.IsNaN(norm) ? double.PositiveInfinity : norm;
    }

    /// <summary>The component contributing most to the last scaled error (non-finite ones first), for messages.</summary>
    public static int WorstComponent(double[] error, double[] y, double[] yNew, double rtol, double atol)
    {
        var worst = 0;
        var worstValue = -1.0;
        for (var i = 0; i < error.Length; i++)
        {
            if (!double.IsFinite(yNew[i]) || !double.IsFinite(error[i])) return i;
            if (error[i] == 0) continue;
            var r = Math.Abs(error[i]) / (atol + rtol * Math.Max(Math.Abs(y[i]), Math.Abs(yNew[i])));
            if (r > worstValue) { worstValue = r; worst = i; }
        }
        return worst;
    }
}

/// <summary>
/// The starting step of Hairer, Nørsett &amp; Wanner (Solving ODEs I, Sect. II.4, "Starting step size"):
/// h₀ = 0.01·‖y₀‖/‖f₀‖, one explicit Euler step to estimate the second derivative, then
/// h = min(100·h₀, (0.01/max(‖f₀‖, ‖y''‖))^(1/p)).
/// </summary>
internal static class InitialStepSize
{
    /// <param name="system">The problem.</param>
    /// <param name="t">Start time.</param>
    /// <param name="y">Start state.</param>
    /// <param name="f">f(t, y).</param>
    /// <param name="order">Order p of the method.</param>
    /// <param name="maxStep">Upper bound (the segment length).</param>
    /// <param name="rtol">Relative tolerance.</param>
    /// <param name="atol">Absolute tolerance.</param>
    /// <param name="yTrial">Scratch of length n.</param>
    /// <param name="fTrial">Scratch of length n.</param>
    /// <param name="statistics">Counts the extra evaluation.</param>
    public static double Choose(
        IOdeSystem system, double t, double[] y, double[] f, int order, double maxStep,
        double rtol, double atol, double[] yTrial, double[] fTrial, OdeStatistics statistics)
    {
        var n = y.Length;
        double d0 = 0, d1 = 0;
        for (var i = 0; i < n; i++)
        {
            var scale = atol + rtol * Math.Abs(y[i]);
            if (scale == 0) continue; // y_i = 0 under a purely relative tolerance carries no scale
            d0 += (y[i] / scale) * (y[i] / scale);
            d1 += (f[i] / scale) * (f[i] / scale);
        }
        d0 = Math.Sqrt(d0 / n);
        d1 = Math.Sqrt(d1 / n);
        var h0 = d0 < 1e-10 || d1 < 1e-10 ? 1e-6 : 0.01 * d0 / d1;
        h0 = Math.Min(h0, maxStep);
        for (var i = 0; i < n; i++) yTrial[i] = y[i] + h0 * f[i];
        system.Derivative(t + h0, yTrial, fTrial);
        statistics.FunctionEvaluations++;
        var d2 = 0.0;
        for (var i = 0; i < n; i++)
        {
            var scale = atol + rtol * Math.Abs(y[i]);
            if (scale == 0) continue;
            var r = (fTrial[i] - f[i]) / scale;
            d2 += r * r;
        }
        d2 = Math.Sqrt(d2 / n) / h0;
        if (!double.IsFinite(d2)) return Math.Min(h0 * 1e-3, maxStep);
        var largest = Math.Max(d1, d2);
        var h1 = largest <= 1e-15 ? Math.Max(1e-6, h0 * 1e-3) : Math.Pow(0.01 / largest, 1.0 / order);
        return Math.Min(Math.Min(100 * h0, h1), maxStep);
    }
}
