using CopyNumber.Kinetics;
using System.Text;
using System.Xml.Linq;
using CopyNumber.Language;

namespace CopyNumber.Sbml;

/// <summary>One import in progress: the SBML model's parts, the names they get, and the text written from them.</summary>
internal sealed class SbmlTranslation(XDocument document, string file, IReadOnlyList<string> lines, SbmlImportOptions options)
{
    private static readonly XNamespace MathMl = MathMlReader.MathMl;
    private static readonly string[] Reserved = ["time", "replicate", "size"];

    private sealed record Compartment(string Id, XElement Element, double? Size);
    private sealed record Species(string Id, XElement Element, string Compartment, bool Concentration, bool Held, double? Amount, double? Concentration0);
    private sealed record Parameter(string Id, XElement Element, double? Value);

    private readonly List<Diagnostic> _refusals = [];
    private readonly List<string> _notes = [];
    private readonly Dictionary<string, Compartment> _compartments = [];
    private readonly Dictionary<string, Species> _species = [];
    private readonly Dictionary<string, Parameter> _parameters = [];
    private readonly Dictionary<string, (SbmlMath Math, XElement Element)> _rules = [];
    private readonly Dictionary<string, (SbmlMath Math, XElement Element)> _initial = [];
    private readonly HashSet<string> _eventTargets = [];
    private readonly HashSet<string> _speciesReferenceIds = [];
    private readonly Dictionary<string, string> _names = [];          // SBML id → network-language name
    private readonly HashSet<string> _taken = [];
    private readonly Dictionary<string, double> _sbmlValues = [];      // initial values, SBML meaning
    private readonly HashSet<string> _evaluating = [];
    private readonly HashSet<string> _inlining = [];
    private Dictionary<string, string> _local = [];                    // local parameter id → name, within one reaction
    private MathMlReader _math = null!;
    private string? _sizeCompartment;
    private int _level, _version;
    private double F => options.MoleculesPerSubstanceUnit;

    public SbmlImportResult Run()
    {
        var text = new StringBuilder();
        var outputs = new Dictionary<SbmlOutput, string>();
        try
        {
            var model = ReadDocument();
            var body = Translate(model, outputs);
            if (_refusals.Count == 0)
            {
                text.Append(Header());
                text.Append(body);
            }
        }
        catch (SbmlRefusal r)
        {
            _refusals.Add(r.ToDiagnostic(file, lines));
        }
        return _refusals.Count > 0
            ? new SbmlImportResult(null, _refusals.OrderBy(d => d.Position.Line).ThenBy(d => d.Position.Column).ToList(), outputs)
            : new SbmlImportResult(text.ToString(), [], outputs);
    }

    private void Refuse(SbmlRefusal r) => _refusals.Add(r.ToDiagnostic(file, lines));

    // ---- reading ----

    private XElement ReadDocument()
    {
        var root = document.Root!;
        if (root.Name.LocalName != "sbml") throw new SbmlRefusal(root, $"the root element is <{root.Name.LocalName}>, not <sbml>: this is not an SBML file");
        _level = (int?)root.Attribute("level") ?? 0;
        _version = (int?)root.Attribute("version") ?? 0;
        if (!((_level == 2 && _version == 4) || (_level == 3 && _version is 1 or 2)))
            throw new SbmlRefusal(root, $"SBML Level {_level} Version {_version} is not read; the importer reads Level 2 Version 4 and Level 3 Versions 1 and 2 (core)");
        var core = root.Name.Namespace;
        foreach (var attribute in root.Attributes().Where(a => a.Name.LocalName == "required" && a.Name.Namespace != XNamespace.None))
            throw new SbmlRefusal(root, $"the SBML package '{root.GetPrefixOfNamespace(attribute.Name.Namespace) ?? attribute.Name.NamespaceName}' is used; only SBML core is read");
        foreach (var element in root.Descendants())
        {
            if (element.Name.Namespace == core || element.Name.Namespace == MathMl) continue;
            if (element.Ancestors().Any(a => a.Name.LocalName is "annotation" or "notes")) continue;
            throw new SbmlRefusal(element, $"the element <{element.Name.LocalName}> belongs to an SBML package ({element.Name.NamespaceName}); only SBML core is read");
        }
        var model = root.Element(core + "model") ?? throw new SbmlRefusal(root, "the file has no <model>");
        if (model.Attribute("conversionFactor") is not null)
            throw new SbmlRefusal(model, "<model conversionFactor> is not supported: give amounts in the species' own units");
        return model;
    }

    private IEnumerable<XElement> List(XElement model, string list, string item) =>
        model.Elements().Where(e => e.Name.LocalName == list).Elements().Where(e => e.Name.LocalName == item);

    private static double? Number(XElement e, string attribute)
    {
        if (e.Attribute(attribute) is not { } a) return null;
        if (!double.TryParse(a.Value, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out var value))
            throw new SbmlRefusal(e, $"{SbmlRefusal.Describe(e)}: '{a.Value}' is not a number ({attribute})");
        if (!double.IsFinite(value))
            throw new SbmlRefusal(e, $"{SbmlRefusal.Describe(e)} has {attribute} {a.Value}; the network language has no infinite or undefined numbers");
        return value;
    }

    private bool Flag(XElement e, string attribute, bool absent) => e.Attribute(attribute) is { } a ? a.Value.Trim() is "true" or "1" : absent;

    private static string Id(XElement e) => (string?)e.Attribute("id") ?? "";

    private SbmlMath MathOf(XElement owner) =>
        owner.Element(MathMl + "math") is { } m ? _math.ReadMath(m) : throw new SbmlRefusal(owner, $"{SbmlRefusal.Describe(owner)} has no <math>");

    private string Translate(XElement model, Dictionary<SbmlOutput, string> outputs)
    {
        var functions = new Dictionary<string, (IReadOnlyList<string>, SbmlMath)>();
        var avogadro = _level == 3 && _version == 1 ? 6.02214179e23 : 6.02214076e23;
        _math = new MathMlReader(functions, avogadro);
        foreach (var f in List(model, "listOfFunctionDefinitions", "functionDefinition"))
            functions[Id(f)] = _math.ReadLambda(f.Element(MathMl + "math") ?? throw new SbmlRefusal(f, $"{SbmlRefusal.Describe(f)} has no <math>"));

        foreach (var c in List(model, "listOfCompartments", "compartment"))
            _compartments[Id(c)] = new Compartment(Id(c), c, Number(c, "size") ?? Number(c, "volume"));
        foreach (var s in List(model, "listOfSpecies", "species"))
        {
            if (s.Attribute("conversionFactor") is not null) Refuse(new SbmlRefusal(s, $"{SbmlRefusal.Describe(s)} has a conversionFactor, which is not supported"));
            var held = Flag(s, "boundaryCondition", false) || Flag(s, "constant", false);
            _species[Id(s)] = new Species(Id(s), s, (string?)s.Attribute("compartment") ?? "", !Flag(s, "hasOnlySubstanceUnits", false), held,
                Number(s, "initialAmount"), Number(s, "initialConcentration"));
        }
        foreach (var p in List(model, "listOfParameters", "parameter"))
            _parameters[Id(p)] = new Parameter(Id(p), p, Number(p, "value"));
        foreach (var ia in List(model, "listOfInitialAssignments", "initialAssignment"))
            Guard(() => _initial[(string?)ia.Attribute("symbol") ?? ""] = (MathOf(ia), ia));
        foreach (var rule in model.Elements().Where(e => e.Name.LocalName == "listOfRules").Elements())
        {
            var kind = rule.Name.LocalName;
            var variable = (string?)rule.Attribute("variable") ?? "";
            if (kind is "assignmentRule" or "parameterRule" or "speciesConcentrationRule" or "compartmentVolumeRule" && (string?)rule.Attribute("type") != "rate")
                Guard(() => _rules[variable] = (MathOf(rule), rule));
            else if (kind == "algebraicRule")
                Refuse(new SbmlRefusal(rule, "<algebraicRule> is not supported: the network language has no algebraic constraints"));
            else
                Refuse(new SbmlRefusal(rule, $"<{kind}> for '{variable}' is not supported: a rate rule is an equation the network language has no form for (only reactions change species)"));
        }
        foreach (var assignment in List(model, "listOfEvents", "event").SelectMany(e => e.Elements().Where(x => x.Name.LocalName == "listOfEventAssignments").Elements()))
            _eventTargets.Add((string?)assignment.Attribute("variable") ?? "");
        foreach (var reference in model.Descendants().Where(e => e.Name.LocalName is "speciesReference" && e.Attribute("id") is not null))
            _speciesReferenceIds.Add(Id(reference));

        ChooseNames(model);
        foreach (var target in _rules.Keys.Concat(_initial.Keys).Concat(_eventTargets).Where(_speciesReferenceIds.Contains))
        {
            var element = _rules.TryGetValue(target, out var r) ? r.Element : _initial.TryGetValue(target, out var i) ? i.Element : model;
            Refuse(new SbmlRefusal(element, $"the stoichiometry '{target}' is set by a rule, initial assignment or event; the network language's stoichiometries are fixed integers"));
        }
        if (_refusals.Count > 0) return "";

        var text = new StringBuilder();
        if (_sizeCompartment is not null)
            text.Append($"size {ExpressionText.Format(SbmlValue(_sizeCompartment, _compartments[_sizeCompartment].Element))}\n");
        if (TimeUnit(model) is { } unit) text.Append($"time unit {unit}\n");
        text.Append(SpeciesSection());
        var reactions = ReactionSection(model, out var localParameters);
        text.Append(ParameterSection(localParameters));
        text.Append(reactions);
        text.Append(ChangeSection(model));
        text.Append(ReadoutSection(outputs));
        foreach (var constraint in List(model, "listOfConstraints", "constraint").Take(1))
            _notes.Add("constraints (<constraint>) only check a simulation; they are not carried over");
        return text.ToString();
    }

    private void Guard(Action read)
    {
        try { read(); }
        catch (SbmlRefusal r) { Refuse(r); }
    }

    private void ChooseNames(XElement model)
    {
        // One constant compartment, set by nothing during the run, is the system size Ω.
        var candidates = _compartments.Values.Where(c => !_rules.ContainsKey(c.Id) && !_eventTargets.Contains(c.Id)).ToList();
        if (_compartments.Count == 1 && candidates.Count == 1)
        {
            var only = candidates[0];
            if (SbmlValue(only.Id, only.Element) > 0)
            {
                _sizeCompartment = only.Id;
                _names[only.Id] = "size";
                _notes.Add($"compartment '{only.Id}' is the system size 'size'");
            }
        }
        else if (_compartments.Count > 1)
            _notes.Add("several compartments: each is a parameter holding its size, and a species' concentration is its amount divided by its compartment's size");
        foreach (var id in _species.Keys.Concat(_compartments.Keys.Where(c => c != _sizeCompartment)).Concat(_parameters.Keys))
            _names[id] = Fresh(id);
    }

    private string Fresh(string wanted)
    {
        var name = Reserved.Contains(wanted) ? wanted + "_sbml" : wanted;
        var candidate = name;
        for (var i = 2; !_taken.Add(candidate); i++) candidate = $"{name}_{i}";
        return candidate;
    }

    // ---- values at time 0, in SBML's meaning of each symbol ----

    /// <summary>The initial value of an SBML symbol as SBML reads it in math (a species' concentration unless hasOnlySubstanceUnits).</summary>
    private double SbmlValue(string id, XElement where)
    {
        if (_sbmlValues.TryGetValue(id, out var known)) return known;
        if (!_evaluating.Add(id)) throw new SbmlRefusal(where, $"the initial value of '{id}' depends on itself");
        double value;
        if (_rules.TryGetValue(id, out var rule)) value = Evaluate(rule.Math, rule.Element);
        else if (_initial.TryGetValue(id, out var ia)) value = Evaluate(ia.Math, ia.Element);
        else if (_species.TryGetValue(id, out var s))
        {
            var volume = () => SbmlValue(s.Compartment, s.Element);
            value = s.Amount is { } a ? (s.Concentration ? a / volume() : a)
                : s.Concentration0 is { } c ? (s.Concentration ? c : c * volume())
                : throw new SbmlRefusal(s.Element, $"{SbmlRefusal.Describe(s.Element)} has no initial amount or concentration");
        }
        else if (_compartments.TryGetValue(id, out var comp))
        {
            if (comp.Size is null) _notes.Add($"compartment '{id}' declares no size; it is taken as 1");
            value = comp.Size ?? 1;
        }
        else if (_parameters.TryGetValue(id, out var p))
            value = p.Value ?? throw new SbmlRefusal(p.Element, $"{SbmlRefusal.Describe(p.Element)} has no value");
        else throw new SbmlRefusal(where, $"'{id}' is not a species, compartment or parameter of the model");
        _evaluating.Remove(id);
        _sbmlValues[id] = value;
        return value;
    }

    private double Evaluate(SbmlMath math, XElement where) => math.Evaluate(name => SbmlValue(name, where));

    /// <summary>A species' initial amount in molecules (the network language's counts).</summary>
    private double InitialAmount(Species s)
    {
        var value = SbmlValue(s.Id, s.Element);
        var amount = (s.Concentration ? value * SbmlValue(s.Compartment, s.Element) : value) * F;
        // An amount within 1e-9 (relative) of a whole number is that number: products like 1.5e-4 × 1e4 miss it by round-off.
        var whole = Math.Round(amount);
        return Math.Abs(amount - whole) <= 1e-9 * Math.Max(1, Math.Abs(amount)) ? whole : amount;
    }

    // ---- expressions in the network language's names ----

    /// <summary>The compartment size a species' concentration divides by, as an expression of the language.</summary>
    private SbmlMath Volume(string compartment, XElement where) => Symbol(compartment, where);

    /// <summary>An SBML symbol in the network language: a species' amount (or concentration = amount / size), a parameter, or a rule's expression inlined.</summary>
    private SbmlMath Symbol(string id, XElement where)
    {
        if (_local.TryGetValue(id, out var local)) return new MathName(local);
        if (_rules.TryGetValue(id, out var rule))
        {
            if (!_inlining.Add(id)) throw new SbmlRefusal(rule.Element, $"the assignment rule for '{id}' depends on itself");
            var inlined = ToCnet(rule.Math, rule.Element);
            _inlining.Remove(id);
            return inlined;
        }
        if (_species.TryGetValue(id, out var s))
        {
            SbmlMath amount = new MathName(_names[id]);
            if (F != 1) amount = SbmlMath.Apply("/", amount, new MathNumber(F));
            return s.Concentration ? SbmlMath.Apply("/", amount, Volume(s.Compartment, s.Element)) : amount;
        }
        if (_names.TryGetValue(id, out var name)) return new MathName(name);
        if (_speciesReferenceIds.Contains(id))
            throw new SbmlRefusal(where, $"'{id}' is a species reference: a stoichiometry used in math is not supported");
        throw new SbmlRefusal(where, $"'{id}' is not a species, compartment or parameter the network language can read (a reaction's id in math is not supported)");
    }

    private bool _lawMayReadTime;

    private SbmlMath ToCnet(SbmlMath math, XElement where) => math.Substitute(node => node switch
    {
        MathName n => Symbol(n.Name, where),
        MathTime when _lawMayReadTime => null,
        MathTime => throw new SbmlRefusal(where, $"{SbmlRefusal.Describe(where)} uses time: of the network language's expressions only rate laws may read time (a trigger 'time >= T' is read as a change at time T)"),
        _ => null,
    });

    // ---- sections ----

    private string SpeciesSection()
    {
        var text = new StringBuilder("\nspecies\n");
        foreach (var s in _species.Values.Where(s => !_rules.ContainsKey(s.Id)))
        {
            var amount = InitialAmount(s);
            if (amount < 0 || !double.IsFinite(amount))
            {
                Refuse(new SbmlRefusal(s.Element, $"{SbmlRefusal.Describe(s.Element)} starts at {amount}; amounts must be finite and not negative"));
                continue;
            }
            text.Append($"  {_names[s.Id]} = {ExpressionText.Format(amount)}{(s.Held ? "  held" : "")}");
            if (s.Concentration) text.Append($"   # concentration × size of '{s.Compartment}'");
            text.Append('\n');
        }
        return text.ToString();
    }

    private string ParameterSection(List<(string Name, double Value)> localParameters)
    {
        var text = new StringBuilder();
        foreach (var c in _compartments.Values.Where(c => c.Id != _sizeCompartment && !_rules.ContainsKey(c.Id)))
            Guard(() => text.Append($"  {_names[c.Id]} = {ExpressionText.Format(SbmlValue(c.Id, c.Element))}   # size of compartment '{c.Id}'\n"));
        foreach (var p in _parameters.Values.Where(p => !_rules.ContainsKey(p.Id)))
            Guard(() => text.Append($"  {_names[p.Id]} = {ExpressionText.Format(SbmlValue(p.Id, p.Element))}\n"));
        foreach (var (name, value) in localParameters) text.Append($"  {name} = {ExpressionText.Format(value)}\n");
        return text.Length == 0 ? "" : "\nparameters\n" + text;
    }

    private string ReactionSection(XElement model, out List<(string Name, double Value)> localParameters)
    {
        localParameters = [];
        var text = new StringBuilder();
        foreach (var reaction in List(model, "listOfReactions", "reaction"))
        {
            var locals = localParameters;
            Guard(() => text.Append(Reaction(reaction, locals)));
        }
        _local = [];
        return text.Length == 0 ? "" : "\nreactions\n" + text;
    }

    private string Reaction(XElement reaction, List<(string Name, double Value)> localParameters)
    {
        var id = Id(reaction);
        if (Flag(reaction, "fast", false))
            throw new SbmlRefusal(reaction, $"{SbmlRefusal.Describe(reaction)} is fast: fast reactions (an equilibrium assumption) are not supported");
        var law = reaction.Elements().FirstOrDefault(e => e.Name.LocalName == "kineticLaw")
            ?? throw new SbmlRefusal(reaction, $"{SbmlRefusal.Describe(reaction)} has no kinetic law, so it has no rate to simulate");
        _local = [];
        foreach (var p in law.Elements().Where(e => e.Name.LocalName is "listOfParameters" or "listOfLocalParameters").Elements())
        {
            var name = Fresh($"{id}_{Id(p)}");
            _local[Id(p)] = name;
            localParameters.Add((name, Number(p, "value") ?? throw new SbmlRefusal(p, $"local parameter '{Id(p)}' of reaction '{id}' has no value")));
        }
        var reactants = Side(reaction, "listOfReactants");
        var products = Side(reaction, "listOfProducts");
        if (AnnotatedMassAction(reaction, law) is { } constant)
            return $"  {(Reserved.Contains(id) ? id + "_sbml" : id)}: {SideText(reactants)} -> {SideText(products)}  mass {constant.ToCnet()}\n";
        // A kinetic law may read time (the engine simulates it exactly by thinning; docs/methods.md); nothing else may.
        _lawMayReadTime = true;
        SbmlMath rate;
        try { rate = ToCnet(MathOf(law), law); }
        finally { _lawMayReadTime = false; }
        if (F != 1) rate = SbmlMath.Apply("*", new MathNumber(F), rate);
        var name0 = Reserved.Contains(id) ? id + "_sbml" : id;
        var line = $"  {name0}: {SideText(reactants)} -> {SideText(products)}  ";
        if (Flag(reaction, "reversible", _level == 2) && Difference(rate) is var (forward, backward))
            return line + Law(forward, reactants) + "  back " + Law(backward, products) + "\n";
        if (Flag(reaction, "reversible", _level == 2))
            _notes.Add($"reaction '{id}' is reversible with a net rate law that is not a difference; it is one column of N, so the net rate must stay non-negative in stochastic runs");
        return line + Law(rate, reactants) + "\n";
    }

    private List<(string Name, int Count)> Side(XElement reaction, string list)
    {
        var terms = new List<(string, int)>();
        foreach (var reference in reaction.Elements().Where(e => e.Name.LocalName == list).Elements())
        {
            var species = (string?)reference.Attribute("species") ?? "";
            if (reference.Elements().Any(e => e.Name.LocalName == "stoichiometryMath"))
                throw new SbmlRefusal(reference, $"<stoichiometryMath> of species '{species}' in reaction '{Id(reaction)}' is not supported: stoichiometries are fixed integers");
            var stoichiometry = Number(reference, "stoichiometry") ?? 1;
            if (stoichiometry == 0) continue;
            var whole = Math.Round(stoichiometry);
            if (stoichiometry < 0 || Math.Abs(stoichiometry - whole) > 1e-9)
                throw new SbmlRefusal(reference, $"stoichiometry {stoichiometry} of species '{species}' in reaction '{Id(reaction)}' is not a positive whole number");
            if (!_species.TryGetValue(species, out var s)) throw new SbmlRefusal(reference, $"'{species}' is not a species");
            if (_rules.ContainsKey(species))
            {
                if (!s.Held) throw new SbmlRefusal(reference, $"species '{species}' is set by an assignment rule and changed by reaction '{Id(reaction)}'");
                continue; // a boundary species set by a rule: the reaction reads it through its law only
            }
            terms.Add((_names[species], (int)whole));
        }
        return terms;
    }

    private static string SideText(List<(string Name, int Count)> side) =>
        side.Count == 0 ? "0" : string.Join(" + ", side.Select(t => t.Count == 1 ? t.Name : $"{t.Count} {t.Name}"));

    /// <summary>A reversible law written as forward − reverse (possibly times a common factor) splits into its two directions.</summary>
    private static (SbmlMath, SbmlMath)? Difference(SbmlMath rate) => rate switch
    {
        MathApply { Operator: "-", Arguments.Count: 2 } d => (d.Arguments[0], d.Arguments[1]),
        MathApply { Operator: "*" } m when Difference(m.Arguments[1]) is var (a, b) => (SbmlMath.Apply("*", m.Arguments[0], a), SbmlMath.Apply("*", m.Arguments[0], b)),
        MathApply { Operator: "*" } m when Difference(m.Arguments[0]) is var (a, b) => (SbmlMath.Apply("*", a, m.Arguments[1]), SbmlMath.Apply("*", b, m.Arguments[1])),
        _ => null,
    };

    /// <summary>
    /// 'mass k' when the law is a species-free factor times each reactant's count once (every coefficient 1:
    /// there the falling factorial of docs/conventions.md is the plain product, so both descriptions are
    /// unchanged); otherwise 'rate' with the law as written, the propensity in amounts (Evans et al. 2008).
    /// </summary>
    private string Law(SbmlMath rate, List<(string Name, int Count)> reactants)
    {
        var species = _species.Keys.Where(k => !_rules.ContainsKey(k)).Select(k => _names[k]).ToHashSet();
        if (reactants.All(r => r.Count == 1) && reactants.Select(r => r.Name).Distinct().Count() == reactants.Count)
        {
            var factors = new List<SbmlMath>();
            Factors(rate, factors);
            var speciesFactors = factors.OfType<MathName>().Where(n => species.Contains(n.Name)).Select(n => n.Name).ToList();
            var rest = factors.Where(f => !(f is MathName n && species.Contains(n.Name))).ToList();
            if (speciesFactors.Count == reactants.Count && speciesFactors.Order().SequenceEqual(reactants.Select(r => r.Name).Order())
                && rest.All(f => !f.Names().Any(species.Contains) && !f.Nodes().OfType<MathTime>().Any())) // a mass-action constant may not read time
            {
                SbmlMath constant = rest.Count == 0 ? new MathNumber(1) : rest.Skip(1).Aggregate(rest[0], (a, b) => SbmlMath.Apply("*", a, b));
                // a = k·Ω^(1−m)·∏x (docs/network-language.md, Mass action), so k = c·Ω^(m−1).
                var order = reactants.Count;
                if (_sizeCompartment is not null && order != 1)
                    constant = order == 0 ? SbmlMath.Apply("/", constant, new MathName("size"))
                        : SbmlMath.Apply("*", constant, order == 2 ? new MathName("size") : SbmlMath.Apply("^", new MathName("size"), new MathNumber(order - 1)));
                return "mass " + constant.ToCnet();
            }
        }
        return "rate " + rate.ToCnet();
    }

    private static void Factors(SbmlMath m, List<SbmlMath> factors)
    {
        if (m is MathApply { Operator: "*" } product)
            foreach (var a in product.Arguments) Factors(a, factors);
        else factors.Add(m);
    }

    private string ChangeSection(XElement model)
    {
        var text = new StringBuilder();
        foreach (var e in InPriorityOrder(List(model, "listOfEvents", "event").ToList()))
            Guard(() => text.Append(Event(e)));
        return text.Length == 0 ? "" : "\nchanges\n" + text;
    }

    private string Event(XElement e)
    {
        var what = SbmlRefusal.Describe(e);
        if (e.Elements().FirstOrDefault(x => x.Name.LocalName == "delay") is { } delay)
            throw new SbmlRefusal(delay, $"{what} has a delay: delayed events are not supported");
        var trigger = e.Elements().FirstOrDefault(x => x.Name.LocalName == "trigger") ?? throw new SbmlRefusal(e, $"{what} has no trigger");
        var condition = MathOf(trigger);
        var initialValue = Flag(trigger, "initialValue", true);
        var assignments = Assignments(e);
        if (assignments.Count == 0) return "";
        var changes = string.Join(", ", assignments);

        if (TimedTrigger(condition) is { } at)
        {
            var time = Evaluate(at, trigger);
            if (time < 0 || time == 0 && initialValue)
            {
                _notes.Add($"event '{Id(e)}' never fires (its trigger time {time} is not after the start)");
                return "";
            }
            return $"  {changes}  at time {ExpressionText.Format(time)}\n";
        }
        var whenever = ToCnet(condition, trigger);
        var line = $"  {changes}  whenever {whenever.ToCnet()}\n";
        // SBML fires an event whose trigger is true at the start only when its initialValue is false (L3V2 section 4.12.2).
        if (!initialValue && Evaluate(condition, trigger) != 0) line = $"  {changes}  at time 0\n" + line;
        return line;
    }

    /// <summary>T in a trigger 'time ≥ T' (or 'time > T', 'T ≤ time', 'T &lt; time') with T free of time and species.</summary>
    private SbmlMath? TimedTrigger(SbmlMath condition)
    {
        if (condition is not MathApply { Arguments.Count: 2 } c) return null;
        var bound = c.Operator switch
        {
            ">=" or ">" when c.Arguments[0] is MathTime => c.Arguments[1],
            "<=" or "<" when c.Arguments[1] is MathTime => c.Arguments[0],
            _ => null,
        };
        if (bound is null || bound.Nodes().OfType<MathTime>().Any() || bound.Names().Any(n => _species.ContainsKey(n) || _rules.ContainsKey(n) || _eventTargets.Contains(n)))
            return null;
        return bound;
    }

    /// <summary>
    /// The event's assignments in the language, ordered so that each value is read before its target is
    /// set: SBML evaluates every value first (L3V2 section 4.12.5), the language applies them in order.
    /// </summary>
    private List<string> Assignments(XElement e)
    {
        var list = new List<(string Target, SbmlMath Value, XElement Element)>();
        var operations = new Dictionary<XElement, (string Operator, SbmlMath Amount)>();
        foreach (var a in e.Elements().Where(x => x.Name.LocalName == "listOfEventAssignments").Elements())
        {
            var variable = (string?)a.Attribute("variable") ?? "";
            var value = ToCnet(MathOf(a), a);
            if (AnnotatedChange(a, variable) is { } change) operations[a] = (change.Operator, ToCnet(change.Amount, a));
            if (_species.TryGetValue(variable, out var s))
            {
                if (s.Concentration) value = SbmlMath.Apply("*", value, Volume(s.Compartment, a));
                if (F != 1) value = SbmlMath.Apply("*", value, new MathNumber(F));
            }
            else if (!_parameters.ContainsKey(variable) && !_compartments.ContainsKey(variable))
                throw new SbmlRefusal(a, $"the event assignment to '{variable}' has no target the network language can change");
            else if (variable == _sizeCompartment)
                throw new SbmlRefusal(a, $"the event assignment changes compartment '{variable}', the system size, which is constant");
            list.Add((_names[variable], value, a));
        }
        var ordered = new List<(string Target, SbmlMath Value, XElement Element)>();
        while (list.Count > 0)
        {
            // Next: an assignment whose target no other remaining value reads (a value must be read before its target is set).
            var next = list.FirstOrDefault(x => !list.Any(y => !ReferenceEquals(y.Element, x.Element) && y.Value.Names().Contains(x.Target)));
            if (next.Element is null)
                throw new SbmlRefusal(e, $"{SbmlRefusal.Describe(e)} assigns variables that read each other in a cycle; applied one after another they would differ from SBML's simultaneous assignment");
            ordered.Add(next);
            list.Remove(next);
        }
        return ordered.Select(x => operations.TryGetValue(x.Element, out var op) ? $"{x.Target} {op.Operator}= {op.Amount.ToCnet()}" : $"{x.Target} = {x.Value.ToCnet()}").ToList();
    }

    /// <summary>
    /// Events in the order SBML executes simultaneous ones: by decreasing priority (L3V2 core section 4.12.6),
    /// file order among equal ones. Only constant priorities are read, and either every event has one or none.
    /// </summary>
    private List<XElement> InPriorityOrder(List<XElement> events)
    {
        var priorities = events.Select(e => e.Elements().FirstOrDefault(x => x.Name.LocalName == "priority")).ToList();
        if (priorities.All(p => p is null)) return events;
        var values = new List<double>();
        for (var i = 0; i < events.Count; i++)
        {
            if (priorities[i] is not { } priority)
                throw new SbmlRefusal(events[i], $"{SbmlRefusal.Describe(events[i])} has no priority while other events have one; SBML leaves their order undefined, and changes here apply in one order");
            var math = MathOf(priority);
            if (math.Names().Any() || math.Nodes().OfType<MathTime>().Any())
                throw new SbmlRefusal(priority, $"{SbmlRefusal.Describe(events[i])} has a priority that is not a constant; only constant priorities are supported (they give the order of simultaneous changes)");
            values.Add(math.Evaluate(_ => 0));
        }
        return events.Select((e, i) => (e, i)).OrderByDescending(x => values[x.i]).ThenBy(x => x.i).Select(x => x.e).ToList();
    }

    /// <summary>
    /// The constant k of a law our export annotated as mass action (SbmlConventions), in the language's names,
    /// when the law is exactly k·Ω^(1−m)·∏ ff(x, ν) over this reaction's reactants in the system size's
    /// compartment; otherwise null and the law is read as written.
    /// </summary>
    private SbmlMath? AnnotatedMassAction(XElement reaction, XElement law)
    {
        var mark = law.Elements().Where(x => x.Name.LocalName == "annotation").Elements(SbmlConventions.Annotation + "massAction").FirstOrDefault();
        if (mark?.Element(MathMl + "math") is not { } kMath || F != 1 || _sizeCompartment is null) return null;
        var reactants = reaction.Elements().Where(x => x.Name.LocalName == "listOfReactants").Elements()
            .Select(r => ((string?)r.Attribute("species") ?? "", (long)Math.Round(Number(r, "stoichiometry") ?? 1))).ToList();
        if (reactants.Any(r => !_species.TryGetValue(r.Item1, out var s) || s.Concentration || _rules.ContainsKey(r.Item1))) return null;
        var k = _math.ReadMath(kMath);
        if (k.Names().Any(_species.ContainsKey) || k.Nodes().OfType<MathTime>().Any()) return null;
        return SbmlConventions.MassActionPropensity(k, reactants, _sizeCompartment).Equals(MathOf(law)) ? ToCnet(k, law) : null;
    }

    /// <summary>
    /// An event assignment our export annotated as an addition or subtraction: when its math is exactly
    /// <c>S + v</c> (or <c>S − v</c>) for its own species S in amounts, the change is <c>S += v</c>, which in
    /// stochastic runs adds the rounded amount (docs/network-language.md), as the model it came from did.
    /// </summary>
    private (string Operator, SbmlMath Amount)? AnnotatedChange(XElement assignment, string variable)
    {
        var mark = assignment.Elements().Where(x => x.Name.LocalName == "annotation").Elements(SbmlConventions.Annotation + "change").FirstOrDefault();
        var op = (string?)mark?.Attribute("operation") switch { "add" => "+", "subtract" => "-", _ => null };
        if (op is null || F != 1 || !_species.TryGetValue(variable, out var s) || s.Concentration) return null;
        return MathOf(assignment) is MathApply { Arguments.Count: 2 } a && a.Operator == op && a.Arguments[0] is MathName n && n.Name == variable
            ? (op, a.Arguments[1]) : null;
    }

    /// <summary>The model's time unit as the language names it, when it is one SbmlConventions knows; null otherwise.</summary>
    private static string? TimeUnit(XElement model)
    {
        if ((string?)model.Attribute("timeUnits") is not { } id) return null;
        if (id == "second") return "second";
        var definition = model.Elements().Where(e => e.Name.LocalName == "listOfUnitDefinitions").Elements().FirstOrDefault(d => (string?)d.Attribute("id") == id);
        var units = definition?.Elements().Where(e => e.Name.LocalName == "listOfUnits").Elements().ToList();
        if (units is not [var unit] || (string?)unit.Attribute("kind") != "second" || (Number(unit, "exponent") ?? 1) != 1) return null;
        var seconds = (Number(unit, "multiplier") ?? 1) * Math.Pow(10, Number(unit, "scale") ?? 0);
        return SbmlConventions.TimeUnitOfSeconds(seconds)?.Name;
    }

    private string ReadoutSection(Dictionary<SbmlOutput, string> outputs)
    {
        var text = new StringBuilder();
        foreach (var (id, rule) in _rules)
        {
            if (_speciesReferenceIds.Contains(id)) continue;
            var name = _names.TryGetValue(id, out var declared) ? declared : _names[id] = Fresh(id);
            Guard(() => text.Append($"  {name} = {ToCnet(rule.Math, rule.Element).ToCnet()}   # assignment rule\n"));
        }
        foreach (var output in options.Outputs)
        {
            Guard(() =>
            {
                var where = document.Root!;
                SbmlMath value;
                if (_species.TryGetValue(output.Id, out var s))
                {
                    var volume = Volume(s.Compartment, where);
                    if (!_rules.ContainsKey(output.Id))
                    {
                        SbmlMath amount = new MathName(_names[output.Id]);
                        if (F != 1) amount = SbmlMath.Apply("/", amount, new MathNumber(F));
                        if (!output.Concentration && amount is MathName plain) { outputs[output] = plain.Name; return; }
                        value = output.Concentration ? SbmlMath.Apply("/", amount, volume) : amount;
                    }
                    else
                    {
                        var sbml = Symbol(output.Id, where);   // SBML's meaning: concentration unless hasOnlySubstanceUnits
                        value = output.Concentration == s.Concentration ? sbml
                            : output.Concentration ? SbmlMath.Apply("/", sbml, volume) : SbmlMath.Apply("*", sbml, volume);
                    }
                }
                else value = Symbol(output.Id, where);
                var name = Fresh($"{output.Id}_{(output.Concentration ? "concentration" : "value")}");
                outputs[output] = name;
                text.Append($"  {name} = {value.ToCnet()}   # reported for comparison\n");
            });
        }
        return text.Length == 0 ? "" : "\nreadouts\n" + text;
    }

    private string Header()
    {
        var text = new StringBuilder();
        text.Append($"# Imported from {Path.GetFileName(file)} (SBML Level {_level} Version {_version}) by copynumber import; docs/sbml.md states every rule.\n");
        text.Append("# Kinetic laws are propensities in amounts (events per unit time), as written, the convention of the\n");
        text.Append("# Discrete Stochastic Models Test Suite (Evans, Gillespie & Wilkinson 2008); a law that is a constant times\n");
        text.Append("# each reactant once is written 'mass'. Species in concentration are read as amount / compartment size;\n");
        text.Append("# assignment rules are inlined where used and reported as readouts; function definitions are inlined.\n");
        if (F != 1) text.Append($"# Amounts are molecules: {ExpressionText.Format(F)} per unit of substance.\n");
        foreach (var note in _notes.Distinct()) text.Append($"# {note}.\n");
        return text.ToString();
    }
}
