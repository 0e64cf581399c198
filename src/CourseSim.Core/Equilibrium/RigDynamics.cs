using CourseSim.Environment;
using CourseSim.Units;

namespace CourseSim.Equilibrium;

/// <summary>Sail forces for one step: drive and side force (N), the share of the rider's heeling limit in use, and the sheet.</summary>
public readonly record struct SailForce(double Drive, double Side, double HeelUse, double SheetFraction);

/// <summary>
/// One set-up's physics resolved into tables the race step can read in nanoseconds (docs/engine.md, "Rig tables").
/// The rider's trim is tabulated against the apparent wind angle beta and the "sheet fraction" f: the sail-side force
/// coefficient as a share of the one at the rider's best unconstrained trim. Because every sail force scales with
/// 0.5 rho AWS^2, the best trim at full power does not depend on the apparent wind speed; the heeling limit then sets the
/// largest f the rider can hold, f_max = M_max / (q A z_CE |c_s*|), and the best trim with side coefficient no larger
/// than f |c_s*| is read from the table. The trim maximises the rig's drive (sail and rider windage); the fin's drag,
/// a few per cent of the drive when planing, is left out of the choice of trim (it is kept in the forces).
/// Built once per set-up and shared (immutable).
/// </summary>
public sealed class RigDynamics
{
    const int BetaSteps = 180;          // 1 deg
    const int FSteps = 20;              // f = 0, 1/20 .. 1
    const double AlphaStepRad = 0.25 * Math.PI / 180;
    const double GradientStep = 0.25, GradientMax = 40;   // m/s at 10 m

    public BoardPhysics Physics { get; }
    public Equipment Equipment => Physics.Equipment;
    public double MassKg { get; }
    public double SailAreaM2 { get; }
    public double CentreOfEffortM { get; }
    public double MaxHeelingMomentNm { get; }
    public double MastHeightM { get; }
    readonly double _ceOverMaxHeel;
    /// <summary>The hull and rider models (shortcuts used by the race step).</summary>
    public Hull.HullModel Hull { get; }
    public Rider.RiderModel Rider { get; }
    readonly double _rhoAir;
    // [beta, f] table, normalised by q A: drive, total side and sail side (for heel), interleaved so a bilinear look-up
    // touches two or three cache lines, and small enough (45 KB a rig) that a fleet's rigs stay in the L2 cache; the
    // attack angle, needed only when a sample is recorded, in a table of its own.
    struct Cell { public float Drive, Side, SailSide; }
    readonly Cell[] _cells;
    readonly float[] _alpha;
    readonly double[] _fullSailSide; // |c_s*| per beta at the best unconstrained trim
    readonly double[] _gradient;

    public RigDynamics(Equipment eq) : this(new BoardPhysics(eq)) { }

    /// <summary>Tables built from a board model: every force comes from <see cref="IBoardModel"/>, none is recomputed here.</summary>
    public RigDynamics(BoardPhysics board) : this(board, null) { }

    /// <summary>Tables read back from the disk cache (<see cref="RigTableStore"/>; shapes checked there): the trim table
    /// as built, the rest worked out from the board model as usual.</summary>
    internal static RigDynamics FromTables(BoardPhysics board, TrimTableData trim) => new(board, trim);

    internal const int TrimCells = (BetaSteps + 1) * (FSteps + 1), TrimRows = BetaSteps + 1;

    RigDynamics(BoardPhysics board, TrimTableData? trim)
    {
        Physics = board;
        MassKg = board.MassKg;
        Hull = Physics.Hull; Rider = Physics.Rider;
        SailAreaM2 = Physics.Sail.AreaM2;
        CentreOfEffortM = Physics.Sail.CentreOfEffortM;
        MaxHeelingMomentNm = Physics.MaxHeelingMomentNm;
        MastHeightM = Physics.Sail.LuffM + BoardPhysics.DeckHeightM;
        _ceOverMaxHeel = CentreOfEffortM / MaxHeelingMomentNm;
        _rhoAir = Physics.AirDensity;
        int nb = BetaSteps + 1, nf = FSteps + 1;
        _cells = new Cell[nb * nf];
        _alpha = new float[nb * nf];
        _fullSailSide = new double[nb];
        if (trim is null) BuildTrimTable(nb, nf);
        else
        {
            for (int j = 0; j < _cells.Length; j++) _cells[j] = new Cell { Drive = trim.Drive[j], Side = trim.Side[j], SailSide = trim.SailSide[j] };
            trim.Alpha.CopyTo(_alpha, 0);
            trim.FullSailSide.CopyTo(_fullSailSide, 0);
        }
        _gradient = new double[(int)(GradientMax / GradientStep) + 2];
        for (int i = 0; i < _gradient.Length; i++) _gradient[i] = WindGradient.Factor(i * GradientStep, Physics.RigHeightM);
    }

    /// <summary>A copy of the trim table for the disk cache.</summary>
    internal TrimTableData ExportTrim() => new()
    {
        Drive = _cells.Select(c => c.Drive).ToArray(), Side = _cells.Select(c => c.Side).ToArray(),
        SailSide = _cells.Select(c => c.SailSide).ToArray(), Alpha = (float[])_alpha.Clone(), FullSailSide = (double[])_fullSailSide.Clone(),
    };

    /// <summary>The board model the tables come from.</summary>
    public IBoardModel Board => Physics;

    void BuildTrimTable(int nb, int nf)
    {
        IBoardModel board = Physics;
        int maxN = (int)(Math.PI / AlphaStepRad) + 2;
        var dr = new double[maxN]; var sd = new double[maxN]; var ss = new double[maxN]; var al = new double[maxN];
        for (int b = 0; b < nb; b++)
        {
            double beta = Unit.DegToRad(b);
            var (lo, hi) = board.SheetingRange(beta);
            int n;
            if (hi <= lo) { n = 1; al[0] = Physics.Sail.LuffAngle - Unit.DegToRad(2); }
            else { n = (int)Math.Ceiling((hi - lo) / AlphaStepRad) + 1; for (int i = 0; i < n; i++) al[i] = lo + (hi - lo) * i / (n - 1.0); }
            int best = 0;
            for (int i = 0; i < n; i++)
            {
                var c = board.Rig(beta, al[i]);
                dr[i] = c.Drive; ss[i] = c.SailSide; sd[i] = c.Side;
                if (dr[i] > dr[best]) best = i;
            }
            if (hi <= lo) dr[0] = Math.Min(dr[0], 0); // head to wind: the sail only luffs
            _fullSailSide[b] = Math.Max(ss[best], 1e-6);
            for (int k = 0; k < nf; k++)
            {
                double limit = _fullSailSide[b] * k / FSteps;
                int pick = -1;
                for (int i = 0; i < n; i++)
                    if (ss[i] <= limit + 1e-12 && (pick < 0 || dr[i] > dr[pick])) pick = i;
                if (pick < 0) // even the luffing sail makes more side force than allowed: luff (the least side force)
                {
                    pick = 0;
                    for (int i = 1; i < n; i++) if (ss[i] < ss[pick]) pick = i;
                }
                int j = b * nf + k;
                _cells[j] = new Cell { Drive = (float)dr[pick], Side = (float)sd[pick], SailSide = (float)ss[pick] };
                _alpha[j] = (float)al[pick];
            }
        }
    }

    /// <summary>Ratio of wind at the rig's centre of effort to the 10 m wind (log law, tabulated).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public double GradientFactor(double u10)
    {
        double x = Math.Clamp(u10, 0, GradientMax) * (1 / GradientStep);
        int i = Math.Min((int)x, _gradient.Length - 2);
        return _gradient[i] + (x - i) * (_gradient[i + 1] - _gradient[i]);
    }

    /// <summary>Largest sheet fraction the rider can hold at apparent wind speed <paramref name="aws"/> (m/s) and angle beta (rad, 0..pi).</summary>
    public double MaxSheetFraction(double aws, double betaRad)
    {
        double q = 0.5 * _rhoAir * aws * aws;
        double full = q * SailAreaM2 * CentreOfEffortM * FullSailSide(betaRad);
        return HeelCap(full);
    }

    /// <summary>Sheet fraction the rider can hold when the full sail would heel with moment <paramref name="fullMomentNm"/> (N m).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    double HeelCap(double fullMomentNm) => fullMomentNm <= MaxHeelingMomentNm ? 1.0 : MaxHeelingMomentNm / fullMomentNm;

    double FullSailSide(double betaRad)
    {
        double x = Math.Clamp(Unit.RadToDeg(betaRad), 0, BetaSteps);
        int i = Math.Min((int)x, BetaSteps - 1);
        return _fullSailSide[i] + (x - i) * (_fullSailSide[i + 1] - _fullSailSide[i]);
    }

    /// <summary>
    /// The step's trim in one pass: the rider's sheet moves by <paramref name="gain"/> (0..1) of the way from
    /// <paramref name="sheet"/> towards the wanted power capped by the heel limit; returns the sail force at the new sheet.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public SailForce Trim(double aws, double betaRad, double wantPower, ref double sheet, double gain)
    {
        double x = Math.Clamp(betaRad * (180 / Math.PI), 0, BetaSteps);
        int i = Math.Min((int)x, BetaSteps - 1);
        double fx = x - i;
        double qa = 0.5 * _rhoAir * aws * aws * SailAreaM2;
        double fullSide = _fullSailSide[i] + fx * (_fullSailSide[i + 1] - _fullSailSide[i]);
        double full = qa * CentreOfEffortM * fullSide;
        double cap = HeelCap(full);
        double want = Math.Min(wantPower, cap);
        double f = sheet + gain * (want - sheet);
        sheet = f;
        return Lookup(i, fx, f, qa);
    }

    /// <summary>The bilinear look-up of the trim table at beta row i (+fx) and sheet f, scaled by q A.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    SailForce Lookup(int i, double fx, double f, double qa)
    {
        double y = Math.Clamp(f, 0, 1) * FSteps;
        int k = Math.Min((int)y, FSteps - 1);
        double fy = y - k;
        const int nf = FSteps + 1;
        int j00 = i * nf + k, j10 = j00 + nf;
        double w00 = (1 - fx) * (1 - fy), w01 = (1 - fx) * fy, w10 = fx * (1 - fy), w11 = fx * fy;
        ref readonly var c00 = ref _cells[j00]; ref readonly var c01 = ref _cells[j00 + 1];
        ref readonly var c10 = ref _cells[j10]; ref readonly var c11 = ref _cells[j10 + 1];
        double cd = w00 * c00.Drive + w01 * c01.Drive + w10 * c10.Drive + w11 * c11.Drive;
        double cs = w00 * c00.Side + w01 * c01.Side + w10 * c10.Side + w11 * c11.Side;
        double css = w00 * c00.SailSide + w01 * c01.SailSide + w10 * c10.SailSide + w11 * c11.SailSide;
        return new SailForce(qa * cd, qa * cs, qa * css * _ceOverMaxHeel, f);
    }

    /// <summary>Sail force at apparent wind speed (m/s) and angle beta (rad, 0..pi) with sheet fraction f (0..1).</summary>
    public SailForce Sail(double aws, double betaRad, double f)
    {
        double x = Math.Clamp(Unit.RadToDeg(betaRad), 0, BetaSteps);
        int i = Math.Min((int)x, BetaSteps - 1);
        return Lookup(i, x - i, f, 0.5 * _rhoAir * aws * aws * SailAreaM2);
    }

    /// <summary>Rig and rider force while the rider steps round the mast in a tack (the board model's
    /// <see cref="IBoardModel.CrossingRig"/> scaled by q A): drive (negative: drag) and side force, no heel.</summary>
    public SailForce Crossing(double aws, double betaRad)
    {
        var c = Physics.CrossingRig(betaRad);
        double qa = 0.5 * _rhoAir * aws * aws * SailAreaM2;
        return new SailForce(qa * c.Drive, qa * c.Side, 0, 0);
    }

    /// <summary>The rider's attack angle (rad) at apparent wind angle beta (rad, 0..pi) and sheet fraction f.</summary>
    public double AttackAngle(double betaRad, double f)
    {
        double x = Math.Clamp(Unit.RadToDeg(betaRad), 0, BetaSteps);
        int i = Math.Min((int)x, BetaSteps - 1);
        double fx = x - i;
        double y = Math.Clamp(f, 0, 1) * FSteps;
        int k = Math.Min((int)y, FSteps - 1);
        double fy = y - k;
        const int nf = FSteps + 1;
        int j00 = i * nf + k, j10 = j00 + nf;
        return (1 - fx) * ((1 - fy) * _alpha[j00] + fy * _alpha[j00 + 1]) + fx * ((1 - fy) * _alpha[j10] + fy * _alpha[j10 + 1]);
    }

    /// <summary>
    /// Fin drag (N) and leeway (rad) carrying side force <paramref name="side"/> (N) at water speed V (m/s): the board
    /// model's <see cref="BoardPhysics.FinLoadAt"/>; spun is true when the fin ventilates at speed.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public double Fin(double side, double speed, out double leewayRad, out bool spun)
    {
        var f = Physics.FinLoadAt(side, speed);
        leewayRad = f.LeewayRad; spun = f.SpunOut;
        return f.Drag;
    }

    /// <summary>Largest side force (N) the fin carries at water speed V before it ventilates.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public double FinCapacity(double speed) => Physics.FinCapacity(speed);

    /// <summary>
    /// Largest sheet fraction whose side force the fin carries at water speed V without ventilating (1 if the fin holds
    /// full power, or the board is too slow to spin out): the rider sheets out, as the velocity prediction's trim does.
    /// </summary>
    public double FinSheetCap(double aws, double betaRad, double speed, double upper)
    {
        if (speed < Physics.SpinOutMinSpeed) return upper;
        double qa = 0.5 * _rhoAir * aws * aws * SailAreaM2;
        if (qa <= 0) return upper;
        double target = FinCapacity(speed) / qa; // the largest side coefficient the fin holds
        // Along f at this beta the table's side coefficient is piecewise linear (bilinear interpolation), so the sheet
        // where it reaches the fin's limit is found exactly by walking the f columns.
        double x = Math.Clamp(betaRad * (180 / Math.PI), 0, BetaSteps);
        int i = Math.Min((int)x, BetaSteps - 1);
        double fx = x - i;
        const int nf = FSteps + 1;
        int row0 = i * nf, row1 = row0 + nf;
        double Side(int kk) => Math.Abs((1 - fx) * _cells[row0 + kk].Side + fx * _cells[row1 + kk].Side);
        if (Side(0) > target) return 0;
        // Start from the column of the sheet held (the answer is usually a column or two away) and walk to the crossing.
        int k = (int)Math.Clamp(Math.Ceiling(Math.Clamp(upper, 0, 1) * FSteps), 1, FSteps);
        while (k > 1 && Side(k - 1) > target) k--;
        while (k < FSteps && Side(k) <= target) k++;
        double lo = Side(k - 1), hi = Side(k);
        if (hi <= target) return upper;
        double f = (k - 1 + (target - lo) / (hi - lo)) / FSteps;
        return Math.Min(f, upper);
    }

    /// <summary>
    /// Net surge force (N) for steady sailing at true wind angle <paramref name="twaRad"/> (0..pi) and water speed V in a
    /// wind <paramref name="windAtRig"/> (m/s at the rig), at the largest sheet fraction the rider can hold (heel and fin
    /// limits): the force the engine integrates, used to build the rig's own polar for tactics.
    /// </summary>
    public double SteadyNetForce(double windAtRig, double twaRad, double speed, double sheetCap = 1)
    {
        var aw = ApparentWind.From(windAtRig, twaRad, speed);
        double f = Math.Min(sheetCap, MaxSheetFraction(aw.Speed, aw.AngleRad));
        f = FinSheetCap(aw.Speed, aw.AngleRad, speed, f);
        var s = Sail(aw.Speed, aw.AngleRad, f);
        double finDrag = Fin(s.Side, speed, out _, out _);
        return s.Drive - finDrag - Physics.Resistance(speed);
    }

    /// <summary>Speed (m/s) from which a board getting going counts as planing (<see cref="Hull.HullModel.PlaningFroude"/>).</summary>
    public double PlaningSpeed => Hull.SpeedAtFroude(CourseSim.Hull.HullModel.PlaningFroude);

    /// <summary>Speed (m/s) below which a planing board drops off the plane (<see cref="Hull.HullModel.DropOffFroude"/>).</summary>
    public double DropOffSpeed => Hull.SpeedAtFroude(CourseSim.Hull.HullModel.DropOffFroude);

    /// <summary>Pumping thrust (N) at board speed V with the rider's short-burst power, bounded by the boom pull
    /// (<see cref="Rider.RiderModel.MaxPumpThrustN"/>).</summary>
    public double BurstPumpThrust(double speed) => Rider.PumpThrust(Rider.PowerFor(VelocityPrediction.PumpBurstS), speed);

    /// <summary>
    /// Time (s) for a board at <paramref name="fromSpeed"/> (m/s) to get planing at true wind speed (m/s, 10 m) and angle
    /// (rad), sheeted to the most the rider can hold, pumping or not: the surge equation m dV/dt = F(V) + pump(V)
    /// integrated in 0.05 s steps (semi-implicit Euler, as the race step) until the board reaches
    /// <see cref="PlaningSpeed"/>. Infinity if it does not within <paramref name="maxS"/> (stuck under the hump). What a
    /// manoeuvre that leaves the plane costs on top of the turn itself comes out of this.
    /// </summary>
    public double TimeToPlane(double twsMs, double twaRad, double fromSpeed, bool pumping, double maxS = 120)
    {
        const double dt = 0.05;
        double atRig = twsMs * GradientFactor(twsMs), twa = Math.Abs(Unit.WrapRadPi(twaRad));
        double target = PlaningSpeed, v = Math.Max(0, fromSpeed);
        for (double t = 0; t < maxS; t += dt)
        {
            if (v >= target) return t;
            double f = SteadyNetForce(atRig, twa, v) + (pumping ? BurstPumpThrust(v) : 0);
            v = Math.Max(0, v + f * dt / MassKg);
        }
        return double.PositiveInfinity;
    }
}
