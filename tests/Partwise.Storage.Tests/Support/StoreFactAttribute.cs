using Xunit.Abstractions;
using Xunit.Sdk;

namespace Partwise.Storage.Tests.Support;

/// <summary>
/// A fact of the provider-independent suite. The suite's methods are declared once, in an abstract class, and run
/// once per derived class; the attribute on them cannot tell which class it is discovered for, so the skip is
/// decided by <see cref="StoreFactDiscoverer"/>: in a class marked <see cref="NeedsPostgresAttribute"/> it skips
/// like <see cref="PostgresFactAttribute"/> does.
/// </summary>
[AttributeUsage(AttributeTargets.Method)]
[XunitTestCaseDiscoverer("Partwise.Storage.Tests.Support.StoreFactDiscoverer", "Partwise.Storage.Tests")]
public sealed class StoreFactAttribute : FactAttribute;

/// <summary>Marks a suite class whose store is PostgreSQL, so its <see cref="StoreFactAttribute"/> tests need a server.</summary>
[AttributeUsage(AttributeTargets.Class)]
public sealed class NeedsPostgresAttribute : Attribute;

/// <summary>Discovers <see cref="StoreFactAttribute"/> tests, skipping them in a <see cref="NeedsPostgresAttribute"/> class without a server.</summary>
public sealed class StoreFactDiscoverer(IMessageSink diagnosticMessageSink) : FactDiscoverer(diagnosticMessageSink)
{
    /// <inheritdoc />
    protected override IXunitTestCase CreateTestCase(ITestFrameworkDiscoveryOptions discoveryOptions, ITestMethod testMethod, IAttributeInfo factAttribute)
    {
        var needsPostgres = testMethod.TestClass.Class.GetCustomAttributes(typeof(NeedsPostgresAttribute).AssemblyQualifiedName).Any();
        if (needsPostgres && PostgresEnvironment.SkipReason is { } why)
        {
            return new XunitSkippedDataRowTestCase(
                DiagnosticMessageSink,
                discoveryOptions.MethodDisplayOrDefault(),
                discoveryOptions.MethodDisplayOptionsOrDefault(),
                testMethod,
                why);
        }

        return base.CreateTestCase(discoveryOptions, testMethod, factAttribute);
    }
}
