using System.Collections.ObjectModel;
using System.Text;

namespace CopyNumber.Network;

/// <summary>
/// A linear combination of copy numbers that no reaction changes: Σ cᵢ·xᵢ(t) = <see cref="Total"/> for
/// all t, because cᵀN = 0 (Heinrich &amp; Schuster 1996, The Regulation of Cellular Systems, ch. 2).
/// </summary>
/// <param name="Coefficients">
/// One integer cᵢ per species, in declaration order. Laws made by <see cref="StoichiometricStructure"/>
/// are primitive (the entries are coprime) and their first nonzero entry is positive.
/// </param>
/// <param name="Total">Σ cᵢ·xᵢ(0), in molecules (copy numbers weighted by the coefficients).</param>
public sealed record ConservationLaw(IReadOnlyList<long> Coefficients, long Total)
{
    private readonly IReadOnlyList<long> _coefficients = Copy(Coefficients);

    /// <summary>One integer coefficient per species, in declaration order.</summary>
    public IReadOnlyList<long> Coefficients
    {
        get => _coefficients;
        init => _coefficients = Copy(value);
    }

    /// <summary>Indices of the species with a nonzero coefficient, increasing.</summary>
    public IReadOnlyList<int> Species =>
        Enumerable.Range(0, _coefficients.Count).Where(i => _coefficients[i] != 0).ToArray().AsReadOnly();

    /// <summary>
    /// The law as a readable equation, terms in species order, coefficient 1 left out:
    /// <c>g_off + g_on = 1</c>, <c>P + 2 D = 60</c>, <c>A - B = 3</c>.
    /// </summary>
    /// <param name="species">Species names, one per coefficient.</param>
    /// <exception cref="ArgumentException">The number of names differs from the number of coefficients.</exception>
    public string Describe(IReadOnlyList<string> species)
    {
        ArgumentNullException.ThrowIfNull(species);
        if (species.Count != _coefficients.Count)
            throw new ArgumentException(
                $"a conservation law over {_coefficients.Count} species cannot be described with {species.Count} species names",
                nameof(species));
        var text = new StringBuilder();
        for (var i = 0; i < _coefficients.Count; i++)
        {
            var c = _coefficients[i];
            if (c == 0) continue;
            if (text.Length == 0) text.Append(c < 0 ? "-" : "");
            else text.Append(c < 0 ? " - " : " + ");
            // Written as an unsigned magnitude so that long.MinValue prints correctly too.
            var magnitude = c < 0 ? (ulong)(-(c + 1)) + 1 : (ulong)c;
            if (magnitude != 1) text.Append(magnitude).Append(' ');
            text.Append(species[i]);
        }
        if (text.Length == 0) text.Append('0');
        return text.Append(" = ").Append(Total).ToString();
    }

    /// <summary>Two laws are equal when their coefficients agree entry by entry and their totals agree.</summary>
    public bool Equals(ConservationLaw? other) =>
        other is not null && Total == other.Total && _coefficients.SequenceEqual(other._coefficients);

    /// <inheritdoc />
    public override int GetHashCode()
    {
        var hash = new HashCode();
        hash.Add(Total);
        foreach (var c in _coefficients) hash.Add(c);
        return hash.ToHashCode();
    }

    /// <summary>The coefficients and total, e.g. <c>[1, 0, 1, 0]·x = 5</c>.</summary>
    public override string ToString() => $"[{string.Join(", ", _coefficients)}]·x = {Total}";

    private static ReadOnlyCollection<long> Copy(IReadOnlyList<long> coefficients)
    {
        ArgumentNullException.ThrowIfNull(coefficients);
        return coefficients.ToArray().AsReadOnly();
    }
}
