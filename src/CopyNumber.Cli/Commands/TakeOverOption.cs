using System.CommandLine;

namespace CopyNumber.Cli.Commands;

/// <summary><c>--take-over</c>: the one override of a folder claim this host cannot check (docs/cluster.md).</summary>
internal static class TakeOverOption
{
    public static Option<bool> Create() => new("--take-over")
    {
        Description = "Claim the folder although another host's run (or an unreadable claim) holds it; only when that run is known to have ended. A run alive on this host is never taken over.",
    };
}
