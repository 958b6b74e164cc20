using System.Globalization;
using System.Text;
using System.Xml;
using System.Xml.Linq;
using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Sbml;

/// <summary>One export in progress: the SBML ids chosen for the model's names, the refusals, and the document.</summary>
internal sealed class SbmlExport(LoadedModel model)
{
    private static readonly XNamespace Core = "http://www.sbml.org/sbml/level3/version2/core";
    private static readonly XNamespace Xhtml = "http://www.w3.org/1999/xhtml";
    private static readonly XNamespace Cn = SbmlConventions.Annotation;

    /// <summary>
    /// A repeating change becomes one event per instance (SBML core has no repetition); more than this many
    /// would make a file nobody can read, so such a change is refused with its count.
    /// </summary>
    public const int MaxInstances = 10_000;

    private readonly ModelSyntax _syntax = model.Syntax;
    private readonly ReactionNetwork _network = model.Network;
    private readonly string[] _lines = model.Text.Split('\n').Select(l => l.TrimEnd('\r')).ToArray();
    private readonly List<Diagnostic> _refusals = [];
    private readonly Dictionary<string, string> _ids = new(StringComparer.Ordinal);        // language name → SBML id
    private readonly Dictionary<string, string> _reactionIds = new(StringComparer.Ordinal); // compiled reaction name → SBML id
    private readonly Dictionary<string, string> _renamed = new(StringComparer.Ordinal);
    private readonly Dictionary<string, string> _renamedReactions = new(StringComparer.Ordinal);
    private readonly HashSet<string> _taken = new(StringComparer.Ordinal);
    private readonly List<string> _notes = [];
    private string _compartment = "size";

    public SbmlExportResult Run()
    {
        AllocateIds();
        RefuseCellFeatures();
        var document = new XElement(Core + "sbml", new XAttribute("level", 3), new XAttribute("version", 2),
            new XAttribute(XNamespace.Xmlns + SbmlConventions.AnnotationPrefix, Cn.NamespaceName),
            Model());
        if (_refusals.Count > 0)
            return new SbmlExportResult(null, _refusals.OrderBy(d => d.Position.Line).ThenBy(d => d.Position.Column).ToList(), _renamed, _renamedReactions);
        var text = new StringBuilder();
        using (var writer = XmlWriter.Create(new StringWriter(text, CultureInfo.InvariantCulture),
                   new XmlWriterSettings { Indent = true, IndentChars = "  ", Encoding = new UTF8Encoding(false), NewLineChars = "\n" }))
            new XDocument(new XDeclaration("1.0", "UTF-8", null), document).Save(writer);
        return new SbmlExportResult(text.ToString().Replace("encoding=\"utf-16\"", "encoding=\"UTF-8\"") + "\n", [], _renamed, _renamedReactions);
    }

    // An SBML model is exported from its translation, so a refusal points into that text and says so.
    private void Refuse(SourcePosition at, string message) =>
        _refusals.Add(new Diagnostic(SbmlImporter.IsSbmlPath(_syntax.File) ? $"{_syntax.File} (as imported)" : _syntax.File, at, message,
            at.Line >= 1 && at.Line <= _lines.Length ? _lines[at.Line - 1] : ""));

    /// <summary>Bursts of random size, parameters that vary per cell and a cell cycle have no form in SBML core; refused where they are written.</summary>
    private void RefuseCellFeatures()
    {
        foreach (var p in _syntax.Parameters.Where(p => p.Varies is not null))
            Refuse(p.Position, $"parameter '{p.Name}' varies from cell to cell; SBML core has no distribution of a parameter over replicates, so the model cannot be exported without changing it");
        foreach (var r in _syntax.Reactions)
            foreach (var term in r.Products.Terms.Where(t => t.BurstMean is not null))
                Refuse(term.Position, $"'{term.Species}' is made in bursts of random size; SBML core's stoichiometry is a fixed number, so the model cannot be exported without changing it");
        if (_syntax.Cycle is { } cycle) Refuse(cycle.Position, ModelSupport.CycleRefusal("SBML export"));
    }

    // ---- ids ----

    /// <summary>
    /// SBML ids (SId: a letter or '_', then letters, digits and '_'; L3V2 core section 3.1.7) share one
    /// namespace across species, parameters, compartments and reactions, while the language keeps reaction
    /// names apart. A name that is not a valid SId or is taken is renamed and the mapping stated in the notes.
    /// </summary>
    private void AllocateIds()
    {
        foreach (var name in _network.Species.Concat(_network.Parameters).Concat(_network.Readouts.Select(r => r.Name)))
            _ids[name] = Allocate(name, _renamed);
        _compartment = Allocate("size", null);
        foreach (var reaction in _network.Reactions) _reactionIds[reaction.Name] = Allocate(reaction.Name, _renamedReactions);
    }

    private string Allocate(string wanted, Dictionary<string, string>? record)
    {
        var valid = new StringBuilder();
        foreach (var c in wanted) valid.Append(char.IsAsciiLetterOrDigit(c) || c == '_' ? c : '_');
        if (valid.Length == 0 || char.IsAsciiDigit(valid[0])) valid.Insert(0, '_');
        var id = valid.ToString();
        for (var i = 2; !_taken.Add(id); i++) id = $"{valid}_{i}";
        if (record is not null && id != wanted) record[wanted] = id;
        return id;
    }

    // ---- expressions ----

    /// <summary>A language expression as SBML math in SBML ids; the language's Hill and saturation functions written out (docs/network-language.md).</summary>
    private SbmlMath ToMath(Expr e) => e switch
    {
        NumberExpr n => SbmlMath.Number(n.Value),
        NameExpr n when n.Name == "size" => new MathName(_compartment),
        NameExpr n when n.Name == "time" => new MathTime(),
        NameExpr n => new MathName(_ids[n.Name]),
        NegateExpr n => SbmlMath.Apply("-", ToMath(n.Operand)),
        BinaryExpr b => SbmlMath.Apply(b.Operator.ToString(), ToMath(b.Left), ToMath(b.Right)),
        // SbmlMath names comparisons by the language's own symbols (MathMlWriter maps them to MathML).
        CompareExpr c => SbmlMath.Apply(ExpressionText.Symbol(c.Operator), ToMath(c.Left), ToMath(c.Right)),
        LogicExpr l => SbmlMath.Apply(l.Conjunction ? "and" : "or", ToMath(l.Left), ToMath(l.Right)),
        NotExpr n => SbmlMath.Apply("not", ToMath(n.Operand)),
        CallExpr c => Call(c.Function, c.Arguments.Select(ToMath).ToArray()),
        _ => throw new InvalidOperationException(e.GetType().Name),
    };

    private static SbmlMath Call(string function, SbmlMath[] a) => function switch
    {
        // x^n/(K^n + x^n), K^n/(K^n + x^n) and x/(K + x): the definitions of Kinetics.LawFunctions.
        "hill_act" => SbmlMath.Apply("/", SbmlMath.Apply("^", a[0], a[2]), SbmlMath.Apply("+", SbmlMath.Apply("^", a[1], a[2]), SbmlMath.Apply("^", a[0], a[2]))),
        "hill_rep" => SbmlMath.Apply("/", SbmlMath.Apply("^", a[1], a[2]), SbmlMath.Apply("+", SbmlMath.Apply("^", a[1], a[2]), SbmlMath.Apply("^", a[0], a[2]))),
        "mm" => SbmlMath.Apply("/", a[0], SbmlMath.Apply("+", a[1], a[0])),
        "pow" => SbmlMath.Apply("^", a[0], a[1]),
        // min and max of several arguments are applied pairwise from the left, as the language does.
        "min" or "max" => a.Skip(1).Aggregate(a[0], (x, y) => SbmlMath.Apply(function, x, y)),
        _ => SbmlMath.Apply(function, a),
    };

    // ---- the document ----

    private XElement Model()
    {
        var modelElement = new XElement(Core + "model",
            new XAttribute("id", Allocate(_network.Name, null)), new XAttribute("name", _network.Name),
            new XAttribute("substanceUnits", "item"), new XAttribute("extentUnits", "item"));
        var units = TimeUnit(modelElement);
        var compartments = new XElement(Core + "listOfCompartments",
            new XElement(Core + "compartment", new XAttribute("id", _compartment), new XAttribute("size", Format(_network.Size)),
                new XAttribute("spatialDimensions", 3), new XAttribute("constant", "true")));
        var species = Species();
        var changes = new Changes(this);
        var events = changes.Events();
        var parameters = Parameters(changes.Targets);
        var rules = Readouts();
        var reactions = Reactions();
        modelElement.Add(Notes(), units, compartments, species, parameters, rules, reactions, events);
        return modelElement;
    }

    private XElement? TimeUnit(XElement modelElement)
    {
        if (_syntax.TimeUnit is not { } name) return null;
        if (SbmlConventions.TimeUnitNamed(name) is not { } unit)
        {
            _notes.Add($"The time unit '{name}' has no SBML unit definition here (second, millisecond, minute, hour and day have); the model declares no timeUnits.");
            return null;
        }
        if (unit.Name == "second")
        {
            modelElement.SetAttributeValue("timeUnits", "second");
            return null;
        }
        var id = Allocate(unit.Name, null);
        modelElement.SetAttributeValue("timeUnits", id);
        return new XElement(Core + "listOfUnitDefinitions",
            new XElement(Core + "unitDefinition", new XAttribute("id", id),
                new XElement(Core + "listOfUnits",
                    new XElement(Core + "unit", new XAttribute("kind", "second"), new XAttribute("exponent", 1), new XAttribute("scale", 0),
                        new XAttribute("multiplier", Format(unit.SecondsPerUnit))))));
    }

    private XElement Species()
    {
        var list = new XElement(Core + "listOfSpecies");
        foreach (var (declaration, i) in _syntax.Species.Select((s, i) => (s, i)))
        {
            var amount = _network.InitialAmounts[i];
            // The importer reads an amount within 1e-9 (relative) of a whole number as that number (round-off of concentration × size).
            if (amount != Math.Round(amount) && Math.Abs(amount - Math.Round(amount)) <= 1e-9 * Math.Max(1, Math.Abs(amount)))
                Refuse(declaration.Position, $"species '{declaration.Name}' starts at {Format(amount)}, within 1e-9 of a whole number; SBML import reads such an amount as the whole number, so the round trip would change the model");
            list.Add(new XElement(Core + "species",
                new XAttribute("id", _ids[declaration.Name]), new XAttribute("compartment", _compartment),
                new XAttribute("initialAmount", Format(amount)), new XAttribute("hasOnlySubstanceUnits", "true"),
                new XAttribute("boundaryCondition", _network.Held[i] ? "true" : "false"), new XAttribute("constant", "false")));
        }
        return list;
    }

    private XElement? Parameters(IReadOnlySet<string> changed)
    {
        var list = new XElement(Core + "listOfParameters");
        for (var i = 0; i < _network.Parameters.Count; i++)
        {
            var name = _network.Parameters[i];
            list.Add(new XElement(Core + "parameter", new XAttribute("id", _ids[name]),
                new XAttribute("value", Format(_network.InitialParameterValues[i])), new XAttribute("constant", changed.Contains(name) ? "false" : "true")));
        }
        foreach (var readout in _network.Readouts)
            list.Add(new XElement(Core + "parameter", new XAttribute("id", _ids[readout.Name]), new XAttribute("constant", "false")));
        return list.HasElements ? list : null;
    }

    private XElement? Readouts()
    {
        if (_syntax.Readouts.Count == 0) return null;
        return new XElement(Core + "listOfRules", _syntax.Readouts.Select(r =>
            new XElement(Core + "assignmentRule", new XAttribute("variable", _ids[r.Name]), MathMlWriter.Math(ToMath(r.Value)))));
    }

    private XElement Reactions()
    {
        var list = new XElement(Core + "listOfReactions");
        var columns = new List<(LawKind Kind, Expr Law)>();
        foreach (var r in _syntax.Reactions)
        {
            columns.Add((r.Law, r.Forward));
            if (r.Reversible) columns.Add((r.BackLaw, r.Reverse!));
        }
        if (columns.Count != _network.Reactions.Count)
            throw new InvalidOperationException($"{columns.Count} laws for {_network.Reactions.Count} compiled reactions");
        foreach (var (reaction, (kind, law)) in _network.Reactions.Zip(columns))
        {
            var element = new XElement(Core + "reaction", new XAttribute("id", _reactionIds[reaction.Name]), new XAttribute("reversible", "false"));
            if (reaction.Reactants.Count > 0) element.Add(new XElement(Core + "listOfReactants", reaction.Reactants.Select(Reference)));
            if (reaction.Products.Count > 0) element.Add(new XElement(Core + "listOfProducts", reaction.Products.Select(Reference)));
            var kinetic = new XElement(Core + "kineticLaw");
            if (kind == LawKind.Mass)
            {
                var k = ToMath(law);
                var reactants = reaction.Reactants.Select(r => (_ids[_network.Species[r.Species]], r.Coefficient)).ToList();
                kinetic.Add(new XElement(Core + "annotation", new XElement(Cn + "massAction", MathMlWriter.Math(k))));
                kinetic.Add(MathMlWriter.Math(SbmlConventions.MassActionPropensity(k, reactants, _compartment)));
            }
            else kinetic.Add(MathMlWriter.Math(ToMath(law)));
            element.Add(kinetic);
            list.Add(element);
        }
        return list;
    }

    private XElement Reference((int Species, long Coefficient) term) =>
        new(Core + "speciesReference", new XAttribute("species", _ids[_network.Species[term.Species]]),
            new XAttribute("stoichiometry", term.Coefficient), new XAttribute("constant", "true"));

    private XElement Notes()
    {
        var paragraphs = new List<string>
        {
            $"Exported from {Path.GetFileName(_syntax.File)} by copynumber export (SBML Level 3 Version 2 core; docs/sbml.md states every rule).",
            "Amounts are molecule counts (substance unit: item). Every kinetic law is the reaction's stochastic propensity in molecule counts, events per unit time: the convention of the Discrete Stochastic Models Test Suite (Evans, Gillespie & Wilkinson 2008, Bioinformatics 24:285).",
            "A mass-action law with macroscopic constant k is written k * size^(1 - m) * x * (x - 1) * ..., the falling factorials of its reactants (m reactant molecules in all); its annotation repeats k. The model's rate equations use k * size^(1 - m) * x^n for the same reaction, which the annotation lets copynumber import restore; a reader that takes the law itself as a deterministic rate gets x * (x - 1) where the model has x^2.",
            "Reversible reactions are written as their two directions, name_fwd and name_rev, each with its own law.",
            "Timed changes are events triggered by time >= T; a change repeated every P from T until U is one event per instance. State-triggered changes are events with persistent=\"true\" and initialValue=\"true\" (a condition that holds at the start does not fire; it fires each time it turns from false to true). Priorities follow the file order, timed changes before triggered ones, and useValuesFromTriggerTime=\"false\", so changes at one instant apply one after another, each seeing the one before. Assignments on one line are composed so that SBML's simultaneous assignment gives the same result.",
            "In stochastic runs copynumber rounds a species' new value to the nearest integer (halves away from zero); an event assignment annotated as an addition or subtraction adds the rounded amount.",
            "Readouts are parameters set by assignment rules.",
        };
        paragraphs.AddRange(_notes);
        if (_renamed.Count + _renamedReactions.Count > 0)
            paragraphs.Add("Renamed to become SBML ids (one namespace in SBML): " + string.Join(", ",
                _renamed.Select(kv => $"'{kv.Key}' is '{kv.Value}'").Concat(_renamedReactions.Select(kv => $"reaction '{kv.Key}' is '{kv.Value}'"))) + ".");
        return new XElement(Core + "notes", new XElement(Xhtml + "body", paragraphs.Select(p => new XElement(Xhtml + "p", p))));
    }

    private static string Format(double value) => ExpressionText.Format(value);

    // ---- changes ----

    /// <summary>The timed and triggered change lines as SBML events (docs/sbml.md, Export).</summary>
    private sealed class Changes(SbmlExport export)
    {
        private sealed record Line(SourcePosition Position, IReadOnlyList<AssignmentDecl> Assignments, TriggerDecl? Trigger, IReadOnlyList<int> Orders);

        private readonly List<Line> _lines = Collect(export._syntax);

        /// <summary>The language names some change sets (parameters among them are not constant in SBML).</summary>
        public IReadOnlySet<string> Targets => _lines.SelectMany(l => l.Assignments.Select(a => a.Target)).ToHashSet(StringComparer.Ordinal);

        private static List<Line> Collect(ModelSyntax syntax)
        {
            var timed = syntax.Schedule.Select((s, i) => (s, i)).GroupBy(x => x.s.Position)
                .Select(g => new Line(g.Key, g.Select(x => new AssignmentDecl(x.s.Target, x.s.TargetPosition, x.s.Operation, x.s.Value)).ToList(), null, g.Select(x => x.i).ToList()));
            var triggered = syntax.TriggerLines.Select(t => new Line(t.Position, t.Assignments, t, []));
            return timed.Concat(triggered).ToList();
        }

        public XElement? Events()
        {
            var list = new XElement(Core + "listOfEvents");
            RefuseCascades();
            for (var index = 0; index < _lines.Count; index++)
            {
                var line = _lines[index];
                var priority = _lines.Count - index;   // file order, timed lines first
                if (Assignments(line) is not { } assignments) continue;
                if (line.Trigger is { } trigger)
                {
                    list.Add(Event(export.ToMath(trigger.Condition), initialValue: true, priority, assignments));
                    continue;
                }
                foreach (var time in Instances(line))
                    list.Add(Event(SbmlMath.Apply(">=", new MathTime(), SbmlMath.Number(time)), initialValue: time > 0, priority, assignments));
            }
            return list.HasElements ? list : null;
        }

        /// <summary>
        /// SBML evaluates every trigger again after each event (L3V2 core section 4.12.7); the language after
        /// each round of changes at one instant. The two agree unless a change can turn another line's condition
        /// true or false at that instant, so a condition that reads a name another line sets is refused.
        /// </summary>
        private void RefuseCascades()
        {
            foreach (var line in _lines.Where(l => l.Trigger is not null))
            {
                var read = Names(line.Trigger!.Condition).ToHashSet(StringComparer.Ordinal);
                foreach (var other in _lines.Where(o => !ReferenceEquals(o, line)))
                    foreach (var target in other.Assignments.Select(a => a.Target).Where(read.Contains).Distinct())
                        export.Refuse(line.Position,
                            $"the condition of this change reads '{target}', which the change on line {other.Position.Line} sets: SBML evaluates every trigger again after each event, " +
                            "this language after each round of changes at one instant, so a cascade of changes could differ; SBML core cannot carry this model exactly");
            }
        }

        private static IEnumerable<string> Names(Expr e) => e switch
        {
            NameExpr n => [n.Name],
            NegateExpr n => Names(n.Operand),
            BinaryExpr b => Names(b.Left).Concat(Names(b.Right)),
            CompareExpr c => Names(c.Left).Concat(Names(c.Right)),
            LogicExpr l => Names(l.Left).Concat(Names(l.Right)),
            NotExpr n => Names(n.Operand),
            CallExpr c => c.Arguments.SelectMany(Names),
            _ => [],
        };

        /// <summary>
        /// The line's assignments for SBML's simultaneous assignment: each value with the parameters set earlier
        /// on the line replaced by their new values, so it equals the language's one-after-another result. A value
        /// that reads a species set earlier on the line is refused: the language rounds that species first in
        /// stochastic runs, which SBML math cannot say.
        /// </summary>
        private List<(string Target, SbmlMath Value, ScheduleOperation Operation)>? Assignments(Line line)
        {
            var result = new List<(string, SbmlMath, ScheduleOperation)>();
            var setParameters = new Dictionary<string, SbmlMath>(StringComparer.Ordinal);
            var setSpecies = new HashSet<string>(StringComparer.Ordinal);
            foreach (var a in line.Assignments)
            {
                var id = export._ids[a.Target];
                if (setParameters.ContainsKey(id) || setSpecies.Contains(id))
                {
                    export.Refuse(a.TargetPosition, $"'{a.Target}' is changed twice on this line; an SBML event assigns each variable once (write the two changes as one)");
                    return null;
                }
                var value = export.ToMath(a.Value);
                if (a.Operation != ScheduleOperation.Set) value = SbmlMath.Apply(a.Operation == ScheduleOperation.Add ? "+" : "-", new MathName(id), value);
                if (value.Names().FirstOrDefault(setSpecies.Contains) is { } species)
                {
                    var name = export._ids.First(kv => kv.Value == species).Key;
                    export.Refuse(a.TargetPosition,
                        $"the change of '{a.Target}' reads species '{name}', set earlier on this line; in stochastic runs that species is rounded first, which one SBML event cannot say (put the changes on separate lines)");
                    return null;
                }
                value = value.Substitute(n => n is MathName m && setParameters.TryGetValue(m.Name, out var set) ? set : null);
                result.Add((id, value, a.Operation));
                if (export._network.SpeciesIndex(a.Target) >= 0) setSpecies.Add(id);
                else setParameters[id] = value;
            }
            return result;
        }

        /// <summary>The times of a timed line: its time, or every instance of a repeating one (Timeline's rule).</summary>
        private IReadOnlyList<double> Instances(Line line)
        {
            var change = export._network.Schedule.First(c => c.Order == line.Orders[0]);
            if (change.Every is not { } every) return [change.Time];
            if (double.IsPositiveInfinity(change.Until))
            {
                export.Refuse(line.Position, "a repeating change without 'until' repeats to the end of whatever run uses the model; SBML core has no repetition, so give its last time with 'until' and it is written as one event per instance");
                return [];
            }
            var last = change.Until + Timeline.CoincidenceTolerance * every;
            var count = Math.Floor((last - change.Time) / every) + 1;
            if (count > MaxInstances)
            {
                export.Refuse(line.Position, $"the repeating change happens {count:G6} times; it would be {count:G6} SBML events (at most {MaxInstances:N0} are written)");
                return [];
            }
            var times = new List<double>();
            for (var k = 0L; k < (long)count; k++)
            {
                var time = change.Time + k * every;
                if (time > last) break;
                times.Add(time);
            }
            return times;
        }

        private static XElement Event(SbmlMath trigger, bool initialValue, int priority, List<(string Target, SbmlMath Value, ScheduleOperation Operation)> assignments) =>
            new(Core + "event", new XAttribute("useValuesFromTriggerTime", "false"),
                new XElement(Core + "trigger", new XAttribute("initialValue", initialValue ? "true" : "false"), new XAttribute("persistent", "true"),
                    MathMlWriter.Math(trigger, condition: true)),
                new XElement(Core + "priority", MathMlWriter.Math(SbmlMath.Number(priority))),
                new XElement(Core + "listOfEventAssignments", assignments.Select(a =>
                    new XElement(Core + "eventAssignment", new XAttribute("variable", a.Target),
                        a.Operation == ScheduleOperation.Set ? null
                            : new XElement(Core + "annotation", new XElement(Cn + "change", new XAttribute("operation", a.Operation == ScheduleOperation.Add ? "add" : "subtract"))),
                        MathMlWriter.Math(a.Value)))));
    }
}
