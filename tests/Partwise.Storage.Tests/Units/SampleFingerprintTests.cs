using Partwise.Storage.Screenings;
using Partwise.Storage.Tests.Support;

namespace Partwise.Storage.Tests.Units;

public sealed class SampleFingerprintTests
{
    [Fact]
    public void FingerprintIsTheSha256OfTheDocumentedSerialisation()
    {
        // Reference computed with Python's hashlib and struct (Debian's python3), independently of this code:
        //   vals = {"Ca": 31.9, "Mg": 8.1, "Na": 12.4, "Cl": 17.9, "HCO3": 141.0}
        //   b = b"".join(struct.pack(">i", len(k.encode())) + k.encode() + struct.pack(">d", vals[k]) for k in sorted(vals))
        //   hashlib.sha256(b).hexdigest()
        var values = new Dictionary<string, double> { ["Ca"] = 31.9, ["Mg"] = 8.1, ["Na"] = 12.4, ["Cl"] = 17.9, ["HCO3"] = 141.0 };

        Assert.Equal("85570a30c37dbfe0c8aeb60d3a8f7c9f6d78aac5cca98698e1adbd3bebeb0331", SampleFingerprint.Compute(values));
    }

    [Fact]
    public void TheOrderOfThePartsDoesNotMatter()
    {
        var forward = Samples.Values().ToList();
        var backward = Enumerable.Reverse(forward).ToList();

        Assert.Equal(SampleFingerprint.Compute(forward), SampleFingerprint.Compute(backward));
    }

    [Fact]
    public void AnyChangeOfValueOrPartChangesIt()
    {
        var original = SampleFingerprint.Compute(Samples.Values());
        var nextDouble = Samples.Values(sodium: Math.BitIncrement(12.4));
        var renamed = Samples.Values();
        renamed["NO3"] = renamed["Cl"];
        renamed.Remove("Cl");
        var added = Samples.Values();
        added["K"] = 1.7;
        var dropped = Samples.Values();
        dropped.Remove("Mg");

        var variants = new[] { nextDouble, renamed, added, dropped }.Select(SampleFingerprint.Compute).ToList();

        Assert.DoesNotContain(original, variants);
        Assert.Equal(variants.Count, variants.Distinct().Count());
    }

    [Fact]
    public void NegativeZeroIsTheSameSampleAsZero()
    {
        var zero = Samples.Values(sodium: 0.0);
        var negativeZero = Samples.Values(sodium: -0.0);

        Assert.Equal(SampleFingerprint.Compute(zero), SampleFingerprint.Compute(negativeZero));
    }

    [Fact]
    public void NonFiniteValuesEmptyNamesAndRepeatedPartsAreRefused()
    {
        Assert.Throws<ArgumentException>(() => SampleFingerprint.Compute(Samples.Values(sodium: double.NaN)));
        Assert.Throws<ArgumentException>(() => SampleFingerprint.Compute(Samples.Values(sodium: double.PositiveInfinity)));
        Assert.Throws<ArgumentException>(() => SampleFingerprint.Compute([new("", 1.0)]));
        Assert.Throws<ArgumentException>(() => SampleFingerprint.Compute([new("Na", 1.0), new("Na", 1.0)]));
    }
}
