namespace CopyNumber.Deterministic;

/// <summary>
/// An initial-value problem dy/dt = f(t, y) on ℝⁿ with its exact Jacobian, as the integrators of this
/// namespace see it. Implementations fill caller-owned arrays and must not keep references to them;
/// the integrators call them from one thread at a time.
/// </summary>
public interface IOdeSystem
{
    /// <summary>n, the number of components of y.</summary>
    int Dimension { get; }

    /// <summary>
    /// True when f does not depend on t. The stiff solver then skips the ∂f/∂t term; otherwise it
    /// estimates ∂f/∂t by a forward difference. Defaults to false (always correct, slightly slower).
    /// </summary>
    bool IsAutonomous => false;

    /// <summary>Writes f(t, y) into <paramref name="dydt"/> (length <see cref="Dimension"/>), in units of y per unit time.</summary>
    void Derivative(double t, double[] y, double[] dydt);

    /// <summary>Writes the exact Jacobian ∂f_i/∂y_j at (t, y) into <paramref name="jacobian"/>[i, j] (n × n, every entry).</summary>
    void Jacobian(double t, double[] y, double[,] jacobian);

    /// <summary>A human-readable name of component <paramref name="index"/>, for error messages.</summary>
    string ComponentName(int index) => $"component {index}";
}
