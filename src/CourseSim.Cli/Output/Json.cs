using System.Text.Json;
using System.Text.Json.Serialization;

namespace CourseSim.Cli.Output;

/// <summary>JSON output: snake_case names, numbers rounded to 4 decimals so output is stable and readable.</summary>
public static class Json
{
    sealed class RoundedDouble : JsonConverter<double>
    {
        public override double Read(ref Utf8JsonReader reader, Type typeToConvert, JsonSerializerOptions options) => reader.GetDouble();
        public override void Write(Utf8JsonWriter writer, double value, JsonSerializerOptions options)
        {
            if (double.IsFinite(value)) writer.WriteNumberValue(Math.Round(value, 4));
            else writer.WriteNullValue();
        }
    }

    public static readonly JsonSerializerOptions Options = new()
    {
        PropertyNamingPolicy = JsonNamingPolicy.SnakeCaseLower,
        WriteIndented = true,
        Converters = { new RoundedDouble() },
        DefaultIgnoreCondition = JsonIgnoreCondition.Never,
    };

    public static string Serialize<T>(T value) => JsonSerializer.Serialize(value, Options);
}
