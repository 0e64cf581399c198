using MathNet.Numerics.RootFinding;

namespace CourseSim.Hull;

/// <summary>Result of Savitsky's planing equations at one trim angle.</summary>
public readonly record struct PlaningState(double TrimDeg, double Lambda, double Cv, double ClBeta, double Cl0,
    double MeanBottomSpeed, double FrictionDrag, double Drag, bool InRange);

/// <summary>
/// Savitsky (1964), "Hydrodynamic design of planing hulls", Marine Technology 1(1):71-95, for a prismatic hull of beam b
/// and deadrise beta: speed coefficient Cv = V/sqrt(g b); lift coefficient CLbeta = Delta / (0.5 rho V^2 b^2);
/// CLbeta = CL0 - 0.0065 beta CL0^0.6; CL0 = tau^1.1 (0.0120 lambda^0.5 + 0.0055 lambda^2.5 / Cv^2) (angles in degrees);
/// mean bottom velocity V1 = V sqrt(1 - 0.0120 tau^1.1 / (lambda^0.5 cos tau)); friction Df = 0.5 rho V1^2 lambda b^2 CF / cos beta
/// with CF from the ITTC 1957 line at Re = V1 lambda b / nu; drag D = Delta tan tau + Df / cos tau.
/// Valid 0.6 &lt;= Cv &lt;= 13, 2 &lt;= tau &lt;= 15 deg, lambda &lt;= 4.
/// </summary>
public static class Savitsky
{
    /// <summary>Solves CLbeta = CL0 - 0.0065 beta CL0^0.6 for CL0.</summary>
    public static double Cl0FromClBeta(double clBeta, double deadriseDeg)
    {
        if (deadriseDeg <= 0) return clBeta;
        double c = clBeta;
        for (int i = 0; i < 60; i++)
        {
            double f = c - 0.0065 * deadriseDeg * Math.Pow(c, 0.6) - clBeta;
            double df = 1 - 0.0065 * deadriseDeg * 0.6 * Math.Pow(c, -0.4);
            double next = c - f / df;
            if (next <= 0) next = c / 2;
            if (Math.Abs(next - c) < 1e-14) return next;
            c = next;
        }
        return c;
    }

    /// <summary>Mean wetted length-beam ratio lambda for CL0 at trim tau (deg) and speed coefficient Cv.</summary>
    public static double Lambda(double cl0, double trimDeg, double cv)
    {
        double t11 = Math.Pow(trimDeg, 1.1);
        double F(double lam) => t11 * (0.0120 * Math.Sqrt(lam) + 0.0055 * Math.Pow(lam, 2.5) / (cv * cv)) - cl0;
        if (F(1e-4) >= 0) return 1e-4;
        double hi = 1.0;
        while (F(hi) < 0 && hi < 1e4) hi *= 2;
        return Brent.FindRoot(F, hi / 2 > 1e-4 && F(hi / 2) < 0 ? hi / 2 : 1e-4, hi, 1e-12, 200);
    }

    /// <summary>Planing state at one trim. <paramref name="weightN"/> is the displacement as a force.</summary>
    public static PlaningState At(double weightN, double speed, double beamM, double deadriseDeg, double trimDeg,
        double density, double kinematicViscosity, double gravity = 9.80665)
    {
        double cv = speed / Math.Sqrt(gravity * beamM);
        double clBeta = weightN / (0.5 * density * speed * speed * beamM * beamM);
        double cl0 = Cl0FromClBeta(clBeta, deadriseDeg);
        double lambda = Lambda(cl0, trimDeg, cv);
        double tau = trimDeg * Math.PI / 180.0;
        double v1sq = 1 - 0.0120 * Math.Pow(trimDeg, 1.1) / (Math.Sqrt(lambda) * Math.Cos(tau));
        double v1 = speed * Math.Sqrt(Math.Max(v1sq, 0.05));
        double re = v1 * lambda * beamM / kinematicViscosity;
        double df = 0.5 * density * v1 * v1 * lambda * beamM * beamM * Friction.Ittc1957(re) / Math.Cos(deadriseDeg * Math.PI / 180);
        double drag = weightN * Math.Tan(tau) + df / Math.Cos(tau);
        bool ok = cv >= 0.6 && cv <= 13 && trimDeg >= 2 && trimDeg <= 15 && lambda <= 4;
        return new PlaningState(trimDeg, lambda, cv, clBeta, cl0, v1, df, drag, ok);
    }
}
