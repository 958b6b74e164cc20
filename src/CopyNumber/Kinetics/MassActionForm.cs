namespace CopyNumber.Kinetics;

/// <summary>
/// The shape of a reaction's propensity, chosen at compile time so the hot loop needs no pow and no
/// delegate call for the common mass-action cases.
/// </summary>
public enum PropensityForm : byte
{
    /// <summary><c>0 -> ...</c>: a = c.</summary>
    Constant,
    /// <summary><c>A -> ...</c>: a = c·x_A.</summary>
    Unimolecular,
    /// <summary><c>A + B -> ...</c>: a = c·x_A·x_B.</summary>
    Bimolecular,
    /// <summary><c>2 A -> ...</c>: a = c·x_A·(x_A − 1).</summary>
    Homodimer,
    /// <summary>Any other mass-action reactant list: a = c·∏ ff(x_i, ν_i).</summary>
    GeneralMassAction,
    /// <summary>A <c>rate</c> law, evaluated through its compiled delegate.</summary>
    RateLaw,
}
