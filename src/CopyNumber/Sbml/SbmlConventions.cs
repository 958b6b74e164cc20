using System.Xml.Linq;

namespace CopyNumber.Sbml;

/// <summary>
/// The conventions export and import share, in one place so the round trip cannot drift: our annotation
/// namespace, the mass-action propensity as SBML math, and the time units that map onto SBML units.
/// </summary>
internal static class SbmlConventions
{
    /// <summary>
    /// The namespace of our annotations. An annotation only says how the standard content was written
    /// (a mass-action law's constant, an added amount); the importer believes it only where the standard
    /// math it sits beside is exactly what the annotation says (SBML L3V2 core section 3.2.4: annotations
    /// never change a model's meaning).
    /// </summary>
    public static readonly XNamespace Annotation = "urn:copynumber:sbml:1";

    /// <summary>Prefix of our annotation namespace in written files.</summary>
    public const string AnnotationPrefix = "copynumber";

    /// <summary>
    /// The stochastic propensity of mass action with macroscopic constant <paramref name="k"/>, in molecule
    /// counts (docs/conventions.md): a = k·Ω^(1−m)·∏ ff(x_i, ν_i), with m = Σν_i and the falling factorial
    /// ff(x, ν) = x(x − 1)…(x − ν + 1); as a left-folded product k · Ω^(1−m) · x · (x − 1) · …, the Ω factor
    /// left out when m = 1. <paramref name="size"/> is the compartment holding Ω.
    /// </summary>
    public static SbmlMath MassActionPropensity(SbmlMath k, IReadOnlyList<(string Species, long Coefficient)> reactants, string size)
    {
        var order = reactants.Sum(r => r.Coefficient);
        var product = k;
        if (order != 1) product = SbmlMath.Apply("*", product, SbmlMath.Apply("^", new MathName(size), new MathNumber(1 - order)));
        foreach (var (species, coefficient) in reactants)
            for (var q = 0L; q < coefficient; q++)
                product = SbmlMath.Apply("*", product, q == 0 ? new MathName(species) : SbmlMath.Apply("-", new MathName(species), new MathNumber(q)));
        return product;
    }

    /// <summary>A time unit of the language and its SBML form: multiplier × second.</summary>
    public sealed record TimeUnit(string Name, double SecondsPerUnit);

    // Time unit names with an exact SBML unit definition (SI second and its common multiples).
    private static readonly TimeUnit[] TimeUnits =
    [
        new("second", 1), new("millisecond", 1e-3), new("minute", 60), new("hour", 3600), new("day", 86400),
    ];

    private static readonly Dictionary<string, string> TimeUnitAliases = new(StringComparer.OrdinalIgnoreCase)
    {
        ["s"] = "second", ["sec"] = "second", ["second"] = "second", ["seconds"] = "second",
        ["ms"] = "millisecond", ["millisecond"] = "millisecond", ["milliseconds"] = "millisecond",
        ["min"] = "minute", ["minute"] = "minute", ["minutes"] = "minute",
        ["h"] = "hour", ["hr"] = "hour", ["hour"] = "hour", ["hours"] = "hour",
        ["d"] = "day", ["day"] = "day", ["days"] = "day",
    };

    /// <summary>The SBML time unit a language unit name stands for, or null when it has none.</summary>
    public static TimeUnit? TimeUnitNamed(string name) =>
        TimeUnitAliases.TryGetValue(name, out var canonical) ? TimeUnits.First(u => u.Name == canonical) : null;

    /// <summary>The time unit with <paramref name="seconds"/> seconds per unit, or null.</summary>
    public static TimeUnit? TimeUnitOfSeconds(double seconds) => TimeUnits.FirstOrDefault(u => u.SecondsPerUnit == seconds);
}
