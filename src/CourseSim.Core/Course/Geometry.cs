namespace CourseSim.Courses;

/// <summary>A point or vector on the course plane: x east, y north, metres from the course origin.</summary>
public readonly record struct Vec2(double X, double Y)
{
    public static Vec2 operator +(Vec2 a, Vec2 b) => new(a.X + b.X, a.Y + b.Y);
    public static Vec2 operator -(Vec2 a, Vec2 b) => new(a.X - b.X, a.Y - b.Y);
    public static Vec2 operator *(double k, Vec2 a) => new(k * a.X, k * a.Y);
    public double Length => Math.Sqrt(X * X + Y * Y);
    public Vec2 Unit() { double l = Length; return l < 1e-12 ? new(0, 0) : new(X / l, Y / l); }
    public static double Dot(Vec2 a, Vec2 b) => a.X * b.X + a.Y * b.Y;
    /// <summary>z of the cross product: positive when b is counter-clockwise of a.</summary>
    public static double Cross(Vec2 a, Vec2 b) => a.X * b.Y - a.Y * b.X;
    /// <summary>Unit vector of a compass bearing (deg clockwise from north).</summary>
    public static Vec2 FromBearing(double deg) { var (s, c) = CourseSim.Units.FastMath.SinCos(deg * Math.PI / 180); return new(s, c); }
    /// <summary>The vector (sine, cosine) of an angle: the unit vector of a bearing in radians, from Math.SinCos.</summary>
    public static Vec2 Of((double Sin, double Cos) sc) => new(sc.Sin, sc.Cos);
    /// <summary>Compass bearing (deg, 0..360) of this vector.</summary>
    public double Bearing => CourseSim.Units.Unit.WrapDeg360(CourseSim.Units.FastMath.Atan2(X, Y) * 180 / Math.PI);
}

public static class Segment
{
    /// <summary>
    /// Whether the step p0 -> p1 crosses segment a -> b; t is where along a -> b (0..1). Touching an end counts.
    /// </summary>
    public static bool Crosses(Vec2 p0, Vec2 p1, Vec2 a, Vec2 b, out double t)
    {
        t = 0;
        var r = p1 - p0; var s = b - a;
        double den = Vec2.Cross(r, s);
        if (Math.Abs(den) < 1e-12) return false;
        var q = a - p0;
        double u = Vec2.Cross(q, s) / den;   // along the step
        t = Vec2.Cross(q, r) / den;          // along the segment
        return u >= 0 && u <= 1 && t >= 0 && t <= 1;
    }

    /// <summary>Signed side of p relative to the directed line a -> b: positive on the left.</summary>
    public static double Side(Vec2 a, Vec2 b, Vec2 p) => Vec2.Cross(b - a, p - a);
}
