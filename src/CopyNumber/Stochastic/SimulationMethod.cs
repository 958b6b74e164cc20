namespace CopyNumber.Stochastic;

/// <summary>Which stochastic simulator runs the replicates.</summary>
public enum SimulationMethod
{
    /// <summary>Gillespie's direct method (Gillespie 1976, J. Comput. Phys. 22:403): exact.</summary>
    Direct,
    /// <summary>The next reaction method (Gibson &amp; Bruck 2000, J. Phys. Chem. A 104:1876): exact.</summary>
    NextReaction,
    /// <summary>
    /// Adaptive explicit tau-leaping (Cao, Gillespie &amp; Petzold 2006, J. Chem. Phys. 124:044109):
    /// approximate, the error controlled by <see cref="SimulatorOptions.Epsilon"/>.
    /// </summary>
    TauLeap,
    /// <summary>
    /// The direct method with composition–rejection selection (Slepoy, Thompson &amp; Plimpton 2008, J. Chem.
    /// Phys. 128:205101): exact, with a cost per event that hardly grows with the number of reactions.
    /// </summary>
    CompositionRejection,
}
