using CourseSim.Units;

namespace CourseSim.Equilibrium;

/// <summary>
/// The rig's own polar as the engine's force model gives it (docs/engine.md, "Targets"): steady speed against true
/// wind speed (10 m) and angle, and the best upwind and downwind VMG angles. Agents use it for targets and laylines, so
/// their expectations match the dynamics they sail with. The board starts from rest and pumps (the short-burst power of
/// the velocity prediction) while that still accelerates it; the speed it then holds is the highest stable equilibrium
/// below the speed pumping carried it to.
/// </summary>
public sealed class RigPolar
{
    public const double TwsStepKn = 1, TwsMaxKn = 40;
    const int TwaSteps = 180; // 1 deg
    public RigDynamics Rig { get; }
    readonly float[] _speed;      // [tws, twa] m/s (single precision: the table is read at every decision of every rider)
    readonly double[] _upTwa, _downTwa, _upVmg, _downVmg; // per tws
    readonly int _nt;

    /// <summary>Builds the rig tables and polar of a set-up (tens of milliseconds: share them through a <see cref="RigCache"/>).</summary>
    public static RigPolar Build(Equipment eq) => new(new RigDynamics(eq));

    public RigPolar(RigDynamics rig)
    {
        Rig = rig;
        _nt = (int)(TwsMaxKn / TwsStepKn) + 1;
        _speed = new float[_nt * (TwaSteps + 1)];
        _upTwa = new double[_nt]; _downTwa = new double[_nt]; _upVmg = new double[_nt]; _downVmg = new double[_nt];
        double burst = rig.Physics.Rider.PowerFor(VelocityPrediction.PumpBurstS);
        for (int w = 0; w < _nt; w++)
        {
            double tws = Unit.KnotsToMs(w * TwsStepKn);
            double atRig = tws * rig.GradientFactor(tws);
            double bestUp = 0, bestDown = 0; int upAt = 45, downAt = 150;
            for (int a = 0; a <= TwaSteps; a++)
            {
                double v = SteadySpeed(atRig, Unit.DegToRad(a), burst);
                _speed[w * (TwaSteps + 1) + a] = (float)v;
                double vmg = v * Math.Cos(Unit.DegToRad(a));
                if (a >= 25 && a <= 90 && vmg > bestUp) { bestUp = vmg; upAt = a; }
                if (a >= 90 && a <= 178 && -vmg > bestDown) { bestDown = -vmg; downAt = a; }
            }
            _upTwa[w] = Unit.DegToRad(upAt); _downTwa[w] = Unit.DegToRad(downAt); _upVmg[w] = bestUp; _downVmg[w] = bestDown;
        }
    }

    double SteadySpeed(double windAtRig, double twa, double burstPower)
    {
        const double dv = 0.25, vmax = 40;
        double F(double v) => Rig.SteadyNetForce(windAtRig, twa, v);
        double v1 = dv;
        while (v1 < vmax && F(v1) + Rig.Physics.Rider.PumpThrust(burstPower, v1) > 0) v1 += dv;
        // Without pumping the board settles at the highest root of F at or below v1.
        double hi = v1, fHi = F(hi);
        if (fHi > 0) return hi;
        for (double lo = hi - dv; lo > 0; lo -= dv)
        {
            double fLo = F(lo);
            if (fLo > 0)
            {
                // Bisection inside the bracket to a centimetre per second.
                double a = lo, b = hi;
                for (int i = 0; i < 5; i++) { double m = 0.5 * (a + b); if (F(m) > 0) a = m; else b = m; }
                double fa = F(a), fb = F(b);
                return fa == fb ? a : a + (b - a) * fa / (fa - fb);
            }
            hi = lo; fHi = fLo;
        }
        return 0;
    }

    static (int, double) Index(double x, double step, int n)
    {
        double q = Math.Clamp(x / step, 0, n - 1);
        int i = Math.Min((int)q, n - 2);
        return (i, q - i);
    }

    /// <summary>Steady speed (m/s) at true wind speed (m/s, 10 m) and angle (rad; sign ignored).</summary>
    public double Speed(double twsMs, double twaRad)
    {
        var (w, fw) = Index(Unit.MsToKnots(twsMs), TwsStepKn, _nt);
        var (a, fa) = Index(Unit.RadToDeg(Math.Abs(Unit.WrapRadPi(twaRad))), 1, TwaSteps + 1);
        int r0 = w * (TwaSteps + 1), r1 = r0 + TwaSteps + 1;
        double s0 = _speed[r0 + a] + fa * (_speed[r0 + a + 1] - _speed[r0 + a]);
        double s1 = _speed[r1 + a] + fa * (_speed[r1 + a + 1] - _speed[r1 + a]);
        return s0 + fw * (s1 - s0);
    }

    double Lerp(double[] t, double twsMs)
    {
        var (w, fw) = Index(Unit.MsToKnots(twsMs), TwsStepKn, _nt);
        return t[w] + fw * (t[w + 1] - t[w]);
    }

    /// <summary>Best VMG true wind angle (rad, 0..pi) upwind or downwind at this wind speed.</summary>
    public double BestTwa(double twsMs, bool upwind) => Lerp(upwind ? _upTwa : _downTwa, twsMs);
    /// <summary>Best VMG (m/s, positive) upwind or downwind.</summary>
    public double BestVmg(double twsMs, bool upwind) => Lerp(upwind ? _upVmg : _downVmg, twsMs);
}
