using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using CopyNumber.Kinetics;

namespace CopyNumber.Stochastic;

/// <summary>
/// One reaction's propensity laid out for the simulators' inner loops: the compiled shape, the stochastic
/// constant c_j and up to two reactant species in one small record, so evaluating a mass-action
/// propensity reads one cache line and calls nothing. The general mass-action product and rate laws go
/// through <see cref="Propensities.Evaluate"/>.
/// </summary>
[StructLayout(LayoutKind.Auto)]
internal struct PropensityTerm
{
    /// <summary>c_j, refreshed whenever a parameter changes.</summary>
    public double Constant;
    /// <summary>First reactant species (unimolecular, bimolecular, homodimer forms).</summary>
    public int SpeciesA;
    /// <summary>Second reactant species (bimolecular form).</summary>
    public int SpeciesB;
    /// <summary>The compiled shape.</summary>
    public PropensityForm Form;

    /// <summary>a_j(x) in events per unit time; unchecked (callers test <see cref="IsUsable"/>).</summary>
    /// <param name="term">The reaction's term.</param>
    /// <param name="counts">Reference to element 0 of the state's counts (indices were validated when the terms were built).</param>
    /// <param name="reaction">The reaction index, for the general forms.</param>
    /// <param name="state">Supplies the general forms' arrays.</param>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static double Evaluate(ref PropensityTerm term, ref long counts, int reaction, SimulatorState state)
    {
        switch (term.Form)
        {
            case PropensityForm.Constant:
                return term.Constant;
            case PropensityForm.Unimolecular:
                return term.Constant * Unsafe.Add(ref counts, term.SpeciesA);
            case PropensityForm.Bimolecular:
                return term.Constant * Unsafe.Add(ref counts, term.SpeciesA) * (double)Unsafe.Add(ref counts, term.SpeciesB);
            case PropensityForm.Homodimer:
            {
                double x = Unsafe.Add(ref counts, term.SpeciesA);
                return term.Constant * x * (x - 1.0);
            }
            default:
                return state.EvaluateGeneral(reaction);
        }
    }

    /// <summary>True for a finite value ≥ 0 (false for NaN, negatives and infinities).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool IsUsable(double propensity) => Kinetics.UnusableRate.IsUsable(propensity);
}
