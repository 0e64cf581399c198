using CourseSim.Units;

namespace CourseSim.Equilibrium;

/// <summary>
/// The rig's own polar as the engine's force model gives it (docs/engine.md, "Targets"): sustained speed against true
/// wind speed (10 m) and angle, the best upwind and downwind VMG angles, and the get-planing branch (the speed from a
/// start off the plane at each angle, and the angles at which a board off the plane gets planing). Both branches come
/// from <see cref="PlaningBranches"/> on the rig tables' net force, the same recipe the velocity prediction uses on the
/// board model. Agents use it for targets and laylines, so their expectations match the dynamics they sail with.
/// </summary>
public sealed class RigPolar
{
    public const double TwsStepKn = 1, TwsMaxKn = 40;
    const int TwaSteps = 180; // 1 deg
    public RigDynamics Rig { get; }
    readonly float[] _speed;      // [tws, twa] sustained m/s (single precision: the table is read at every decision of every rider)
    readonly float[] _get;        // [tws, twa] get-planing m/s: from a start off the plane at that angle
    readonly double[] _upTwa, _downTwa, _upVmg, _downVmg; // per tws
    readonly double[] _getUpTwa, _getDownTwa; // per tws: the closest-hauled / deepest angle at which a board off the plane gets planing (NaN: none)
    readonly int _nt;

    /// <summary>Builds the rig tables and polar of a set-up (tens of milliseconds: share them through a <see cref="RigCache"/>).</summary>
    public static RigPolar Build(Equipment eq) => new(new RigDynamics(eq));

    public RigPolar(RigDynamics rig)
    {
        Rig = rig;
        _nt = (int)(TwsMaxKn / TwsStepKn) + 1;
        _speed = new float[_nt * (TwaSteps + 1)];
        _get = new float[_nt * (TwaSteps + 1)];
        _upTwa = new double[_nt]; _downTwa = new double[_nt]; _upVmg = new double[_nt]; _downVmg = new double[_nt];
        _getUpTwa = new double[_nt]; _getDownTwa = new double[_nt];
        double burst = rig.Physics.Rider.PowerFor(VelocityPrediction.PumpBurstS);
        var branches = new PlaningBranches((tws, twa, v) => rig.SteadyNetForce(tws * rig.GradientFactor(tws), twa, v),
            v => rig.Physics.Rider.PumpThrust(burst, v), rig.Hull.SpeedAtFroude(Hull.HullModel.DropOffFroude), 40);
        var get = new bool[TwaSteps + 1];
        for (int w = 0; w < _nt; w++)
        {
            double tws = Unit.KnotsToMs(w * TwsStepKn);
            // The rider can get planing in this wind if the get-planing branch planes at some reaching angle.
            var at = new Branches[TwaSteps + 1];
            bool canGet = false;
            for (int a = 0; a <= TwaSteps; a++)
            {
                at[a] = branches.At(tws, Unit.DegToRad(a), false);
                get[a] = at[a].PlanesWithPumping;
                canGet |= get[a];
            }
            double bestUp = 0, bestDown = 0; int upAt = 45, downAt = 150, getUp = -1, getDown = -1;
            for (int a = 0; a <= TwaSteps; a++)
            {
                var br = canGet ? branches.At(tws, Unit.DegToRad(a), true) : at[a];
                double v = br.Sustained;
                _speed[w * (TwaSteps + 1) + a] = (float)v;
                _get[w * (TwaSteps + 1) + a] = (float)br.GetPlaning;
                double vmg = v * Math.Cos(Unit.DegToRad(a));
                if (a >= 25 && a <= 90 && vmg > bestUp) { bestUp = vmg; upAt = a; }
                if (a >= 90 && a <= 178 && -vmg > bestDown) { bestDown = -vmg; downAt = a; }
                if (get[a] && a <= 90 && getUp < 0) getUp = a;
                if (get[a] && a >= 90) getDown = a;
            }
            _upTwa[w] = Unit.DegToRad(upAt); _downTwa[w] = Unit.DegToRad(downAt); _upVmg[w] = bestUp; _downVmg[w] = bestDown;
            _getUpTwa[w] = getUp < 0 ? double.NaN : Unit.DegToRad(getUp);
            _getDownTwa[w] = getDown < 0 ? double.NaN : Unit.DegToRad(getDown);
        }
    }

    static (int, double) Index(double x, double step, int n)
    {
        double q = Math.Clamp(x / step, 0, n - 1);
        int i = Math.Min((int)q, n - 2);
        return (i, q - i);
    }

    /// <summary>Sustained speed (m/s) at true wind speed (m/s, 10 m) and angle (rad; sign ignored): planing with
    /// hysteresis in a gusty wind (<see cref="PlaningBranches"/>).</summary>
    public double Speed(double twsMs, double twaRad) => Read(_speed, twsMs, twaRad);

    /// <summary>Speed (m/s) a board starting off the plane reaches at this wind and angle (planing only where pumping or
    /// the wind carries it over the hump at this very angle).</summary>
    public double GetPlaningSpeed(double twsMs, double twaRad) => Read(_get, twsMs, twaRad);

    /// <summary>
    /// Angle (rad, 0..pi) a rider off the plane heads to so as to get planing: downwind the deepest, upwind the closest-hauled
    /// angle at which the get-planing branch planes in this wind (nearest listed wind speed); NaN where the board does not
    /// get planing at any angle. Once planing the rider bears away (or heads up) to <see cref="BestTwa"/>.
    /// </summary>
    public double GetPlaningTwa(double twsMs, bool upwind)
    {
        int w = (int)Math.Clamp(Math.Round(Unit.MsToKnots(twsMs) / TwsStepKn), 0, _nt - 1);
        return upwind ? _getUpTwa[w] : _getDownTwa[w];
    }

    double Read(float[] table, double twsMs, double twaRad)
    {
        var _speed = table;
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
