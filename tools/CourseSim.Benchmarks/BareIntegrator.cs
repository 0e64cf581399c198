namespace CourseSim.Benchmarks;

/// <summary>
/// The baseline of every ratio: N agents as structure-of-arrays in double precision (x, y, heading, speed), each step a
/// simple force law (thrust minus quadratic drag), the speed and the position integrated (semi-implicit Euler) along a
/// heading that turns slowly (sine and cosine computed every step). No wind, no neighbours, no rules: the least a 2-D
/// race engine must do per board-step.
/// </summary>
public sealed class BareIntegrator
{
    readonly double[] _x, _y, _h, _v, _turn, _thrust;
    const double Dt = 0.05, DragPerM = 0.02;
    public int Count { get; }

    public BareIntegrator(int n)
    {
        Count = n;
        _x = new double[n]; _y = new double[n]; _h = new double[n]; _v = new double[n]; _turn = new double[n]; _thrust = new double[n];
        for (int i = 0; i < n; i++)
        {
            _x[i] = 5.0 * i; _h[i] = 0.1 * i; _v[i] = 3 + (i % 7) * 0.3;
            _turn[i] = 0.002 * ((i % 11) - 5); // rad/s: a slow turn
            _thrust[i] = 1.0 + (i % 5) * 0.1;   // m/s2
        }
    }

    /// <summary>Steps all agents <paramref name="steps"/> times; returns a checksum so the work cannot be dropped.</summary>
    public double Run(int steps)
    {
        var x = _x.AsSpan(); var y = _y.AsSpan(); var h = _h.AsSpan(); var v = _v.AsSpan();
        var turn = _turn.AsSpan(); var thrust = _thrust.AsSpan();
        int n = Count;
        for (int s = 0; s < steps; s++)
        {
            for (int i = 0; i < n; i++)
            {
                double vi = v[i];
                vi += (thrust[i] - DragPerM * vi * Math.Abs(vi)) * Dt;
                double hi = h[i] + turn[i] * Dt;
                var (sin, cos) = Math.SinCos(hi);
                x[i] += vi * sin * Dt;
                y[i] += vi * cos * Dt;
                v[i] = vi; h[i] = hi;
            }
        }
        double sum = 0;
        for (int i = 0; i < n; i++) sum += x[i] + y[i];
        return sum;
    }

    /// <summary>Nanoseconds per agent-step over a stretch of about <paramref name="agentSteps"/> agent-steps (thread CPU time).</summary>
    public static double MeasureNs(int agents, long agentSteps, ref double sink)
    {
        var b = new BareIntegrator(agents);
        int steps = (int)Math.Max(1, agentSteps / agents);
        sink += b.Run(Math.Max(1, steps / 20)); // touch the arrays and the code first
        double t0 = Machine.ThreadCpuS();
        sink += b.Run(steps);
        return (Machine.ThreadCpuS() - t0) * 1e9 / (steps * (double)agents);
    }
}
