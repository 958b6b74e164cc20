using CopyNumber.Deterministic;

namespace CopyNumber.Tests.Deterministic;

/// <summary>
/// Robertson's chemical kinetics (Robertson 1966, "The solution of a set of reaction rate equations", in
/// Numerical Analysis: An Introduction, ed. Walsh, Academic Press; as stated in Hairer &amp; Wanner,
/// Solving ODEs II, Sect. IV.1): y₁' = −0.04y₁ + 10⁴y₂y₃, y₂' = 0.04y₁ − 10⁴y₂y₃ − 3·10⁷y₂², y₃' = 3·10⁷y₂².
/// </summary>
internal sealed class RobertsonSystem : IOdeSystem
{
    public int Dimension => 3;
    public bool IsAutonomous => true;

    public void Derivative(double t, double[] y, double[] dydt)
    {
        dydt[0] = -0.04 * y[0] + 1e4 * y[1] * y[2];
        dydt[2] = 3e7 * y[1] * y[1];
        dydt[1] = -dydt[0] - dydt[2];
    }

    public void Jacobian(double t, double[] y, double[,] j)
    {
        j[0, 0] = -0.04; j[0, 1] = 1e4 * y[2]; j[0, 2] = 1e4 * y[1];
        j[2, 0] = 0; j[2, 1] = 6e7 * y[1]; j[2, 2] = 0;
        j[1, 0] = 0.04; j[1, 1] = -1e4 * y[2] - 6e7 * y[1]; j[1, 2] = -1e4 * y[1];
    }
}

/// <summary>dy/dt = A·y with a constant matrix.</summary>
internal sealed class LinearSystem(double[,] a) : IOdeSystem
{
    public int Dimension => a.GetLength(0);
    public bool IsAutonomous => true;

    public void Derivative(double t, double[] y, double[] dydt)
    {
        for (var i = 0; i < Dimension; i++)
        {
            var sum = 0.0;
            for (var j = 0; j < Dimension; j++) sum += a[i, j] * y[j];
            dydt[i] = sum;
        }
    }

    public void Jacobian(double t, double[] y, double[,] jacobian) => Array.Copy(a, jacobian, a.Length);
}

/// <summary>q' = p, p' = −ω²q: the harmonic oscillator, energy (p² + ω²q²)/2 conserved.</summary>
internal sealed class HarmonicOscillator(double omega) : IOdeSystem
{
    public int Dimension => 2;

    public void Derivative(double t, double[] y, double[] dydt)
    {
        dydt[0] = y[1];
        dydt[1] = -omega * omega * y[0];
    }

    public void Jacobian(double t, double[] y, double[,] j)
    {
        j[0, 0] = 0; j[0, 1] = 1;
        j[1, 0] = -omega * omega; j[1, 1] = 0;
    }

    public double Energy(double[] y) => 0.5 * (y[1] * y[1] + omega * omega * y[0] * y[0]);
}

/// <summary>
/// The rate equation of 2A → 0 with rate k·A² per pair: dA/dt = −2kA², solved by separation of
/// variables as A(t) = A₀/(1 + 2kA₀t) (the integrated second-order rate law; common practice).
/// </summary>
internal sealed class Dimerisation(double k) : IOdeSystem
{
    public int Dimension => 1;
    public bool IsAutonomous => true;
    public void Derivative(double t, double[] y, double[] dydt) => dydt[0] = -2 * k * y[0] * y[0];
    public void Jacobian(double t, double[] y, double[,] j) => j[0, 0] = -4 * k * y[0];
    public double Exact(double a0, double t) => a0 / (1 + 2 * k * a0 * t);
}

/// <summary>
/// The Prothero–Robinson problem (Prothero &amp; Robinson 1974, Math. Comp. 28:145):
/// y' = λ(y − sin t) + cos t, exact solution y = sin t for y(0) = 0; stiff for large −λ and non-autonomous.
/// </summary>
internal sealed class ProtheroRobinson(double lambda) : IOdeSystem
{
    public int Dimension => 1;
    public void Derivative(double t, double[] y, double[] dydt) => dydt[0] = lambda * (y[0] - Math.Sin(t)) + Math.Cos(t);
    public void Jacobian(double t, double[] y, double[,] j) => j[0, 0] = lambda;
}

/// <summary>
/// A Prothero–Robinson component whose stiffness a(t) = a₀·e^(−5t) fades, beside an oscillator:
/// y₁' = −a(t)(y₁ − cos t) − sin t, y₂' = y₃, y₃' = −y₂; from (1, 1, 0) the solution is (cos t, cos t, −sin t).
/// </summary>
internal sealed class FadingStiffness(double a0) : IOdeSystem
{
    public int Dimension => 3;

    public void Derivative(double t, double[] y, double[] dydt)
    {
        dydt[0] = -a0 * Math.Exp(-5 * t) * (y[0] - Math.Cos(t)) - Math.Sin(t);
        dydt[1] = y[2];
        dydt[2] = -y[1];
    }

    public void Jacobian(double t, double[] y, double[,] j)
    {
        Array.Clear(j);
        j[0, 0] = -a0 * Math.Exp(-5 * t);
        j[1, 2] = 1;
        j[2, 1] = -1;
    }

    public static double[] Exact(double t) => [Math.Cos(t), Math.Cos(t), -Math.Sin(t)];
}

/// <summary>y' = y², y(0) = 1: y = 1/(1 − t) blows up at t = 1.</summary>
internal sealed class BlowUp : IOdeSystem
{
    public int Dimension => 1;
    public bool IsAutonomous => true;
    public void Derivative(double t, double[] y, double[] dydt) => dydt[0] = y[0] * y[0];
    public void Jacobian(double t, double[] y, double[,] j) => j[0, 0] = 2 * y[0];
}

/// <summary>y' = t − y, y(0) = 1: y = t − 1 + 2e^(−t) (linear first-order equation, integrating factor; common practice).</summary>
internal sealed class DrivenRelaxation : IOdeSystem
{
    public int Dimension => 1;
    public void Derivative(double t, double[] y, double[] dydt) => dydt[0] = t - y[0];
    public void Jacobian(double t, double[] y, double[,] j) => j[0, 0] = -1;
    public static double Exact(double t) => t - 1 + 2 * Math.Exp(-t);
}

/// <summary>y' = y·cos t, y(0) = 1: y = e^(sin t) (separation of variables; common practice).</summary>
internal sealed class Modulated : IOdeSystem
{
    public int Dimension => 1;
    public void Derivative(double t, double[] y, double[] dydt) => dydt[0] = y[0] * Math.Cos(t);
    public void Jacobian(double t, double[] y, double[,] j) => j[0, 0] = Math.Cos(t);
    public static double Exact(double t) => Math.Exp(Math.Sin(t));
}

/// <summary>
/// Prothero–Robinson made autonomous: the driver sin t is an oscillator component, as a fast equilibrium
/// is slaved to slow species in chemistry. y₁' = λ(y₁ − y₂) + y₃, y₂' = y₃, y₃' = −y₂; from (0, 0, 1)
/// the solution is (sin t, sin t, cos t).
/// </summary>
internal sealed class SlavedProtheroRobinson(double lambda) : IOdeSystem
{
    public int Dimension => 3;
    public bool IsAutonomous => true;

    public void Derivative(double t, double[] y, double[] dydt)
    {
        dydt[0] = lambda * (y[0] - y[1]) + y[2];
        dydt[1] = y[2];
        dydt[2] = -y[1];
    }

    public void Jacobian(double t, double[] y, double[,] j)
    {
        Array.Clear(j);
        j[0, 0] = lambda; j[0, 1] = -lambda; j[0, 2] = 1;
        j[1, 2] = 1;
        j[2, 1] = -1;
    }
}
