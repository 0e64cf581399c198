using System.Net;
using Microsoft.Extensions.Hosting;

namespace CourseSim.Cli.Viewer;

/// <summary>
/// Which Host headers the viewer answers: localhost, the address it is bound to, the name given with --host, and (when
/// bound to every address) any IP literal. A web page elsewhere that points its own DNS name at this machine (DNS
/// rebinding) sends that name as Host and gets 421; a request with no Host gets 400.
/// </summary>
public sealed class HostCheck(string given, IPAddress bound)
{
    /// <summary>The address to listen on: an IPv4 or IPv6 literal (brackets optional) or "localhost".</summary>
    public static IPAddress Parse(string host)
    {
        string h = host.Trim();
        if (h.Equals("localhost", StringComparison.OrdinalIgnoreCase)) return IPAddress.Loopback;
        bool bracketed = h.StartsWith('[') && h.EndsWith(']');
        if (bracketed) h = h[1..^1];
        bool v6 = h.Contains(':');
        if (!IPAddress.TryParse(h, out var address) || v6 != (address.AddressFamily == System.Net.Sockets.AddressFamily.InterNetworkV6) || bracketed && !v6)
            throw new UsageException($"--host '{host}' is not an IP address (such as 127.0.0.1, ::1, 0.0.0.0) or localhost");
        return address;
    }

    bool Wildcard => bound.Equals(IPAddress.Any) || bound.Equals(IPAddress.IPv6Any);

    public bool Accepts(string hostHeader, out int status)
    {
        status = 200;
        if (string.IsNullOrWhiteSpace(hostHeader)) { status = 400; return false; }
        string name = StripPort(hostHeader.Trim());
        bool ok = name.Equals("localhost", StringComparison.OrdinalIgnoreCase) || name.Equals(given.Trim().Trim('[', ']'), StringComparison.OrdinalIgnoreCase)
            || (IPAddress.TryParse(name, out var ip) && (ip.Equals(bound) || IPAddress.IsLoopback(ip) && IPAddress.IsLoopback(bound) || Wildcard));
        if (!ok) status = 421;
        return ok;
    }

    public string Describe() => Wildcard ? "localhost and IP addresses" : $"localhost and {given}";

    /// <summary>"[::1]:8080" gives "::1", "example:80" gives "example", "::1" stays.</summary>
    static string StripPort(string h)
    {
        if (h.StartsWith('['))
        {
            int end = h.IndexOf(']');
            return end > 0 ? h[1..end] : h;
        }
        int colon = h.IndexOf(':');
        return colon >= 0 && h.IndexOf(':', colon + 1) < 0 ? h[..colon] : h;
    }
}

/// <summary>A host lifetime that takes no signal: the viewer command stops the server itself.</summary>
sealed class QuietLifetime : IHostLifetime
{
    public Task WaitForStartAsync(CancellationToken cancellationToken) => Task.CompletedTask;
    public Task StopAsync(CancellationToken cancellationToken) => Task.CompletedTask;
}
