using System.Globalization;
using Partwise.Deployment.Tests.Support;
using YamlDotNet.RepresentationModel;

namespace Partwise.Deployment.Tests;

/// <summary>The objects of k8s/ refer to each other, to the Dockerfile and to the app consistently.</summary>
public class ManifestTests
{
    private static Manifest Deployment => Manifests.Single("Deployment");

    private static YamlMappingNode PodSpec => Deployment.Root.Map("spec").Map("template").Map("spec");

    private static YamlMappingNode Container => Assert.Single(PodSpec.Maps("containers"));

    private static IReadOnlyDictionary<string, string> PodSelector => Deployment.Root.Map("spec").Map("selector").Strings("matchLabels");

    [Fact]
    public void EveryManifestParsesAndThereIsOneObjectOfEachKindAtItsStableApiVersion()
    {
        var expected = new Dictionary<string, string>
        {
            ["Deployment"] = "apps/v1",
            ["Service"] = "v1",
            ["HorizontalPodAutoscaler"] = "autoscaling/v2",
            ["PodDisruptionBudget"] = "policy/v1",
            ["ConfigMap"] = "v1",
            ["Secret"] = "v1",
            ["NetworkPolicy"] = "networking.k8s.io/v1",
        };
        Assert.Equal(expected.Keys.Order(StringComparer.Ordinal), Manifests.All.Select(m => m.Kind).Order(StringComparer.Ordinal));
        foreach (var manifest in Manifests.All)
        {
            Assert.Equal(expected[manifest.Kind], manifest.ApiVersion);
        }

        // One file per object kind (STYLE.md); the Secret's file says it is an example.
        Assert.Equal(Manifests.All.Count, Manifests.Files().Count());
        Assert.Equal("secret.example.yaml", Manifests.Single("Secret").File);
    }

    [Fact]
    public void TheDeploymentsSelectorMatchesItsPodsAndEveryObjectThatSelectsThem()
    {
        var podLabels = Deployment.Root.Map("spec").Map("template").Map("metadata").Strings("labels");
        Assert.NotEmpty(PodSelector);
        foreach (var (key, value) in PodSelector)
        {
            Assert.True(podLabels.TryGetValue(key, out var label) && label == value, $"the pods lack the selector's label {key}={value}");
        }

        Assert.Equal(PodSelector, Manifests.Single("Service").Root.Map("spec").Strings("selector"));
        Assert.Equal(PodSelector, Manifests.Single("PodDisruptionBudget").Root.Map("spec").Map("selector").Strings("matchLabels"));
        Assert.Equal(PodSelector, Manifests.Single("NetworkPolicy").Root.Map("spec").Map("podSelector").Strings("matchLabels"));
        foreach (var spread in PodSpec.Maps("topologySpreadConstraints"))
        {
            Assert.Equal(PodSelector, spread.Map("labelSelector").Strings("matchLabels"));
        }
    }

    [Fact]
    public void TheAutoscalerScalesThisDeploymentOnCpuFromAtLeastTwoReplicas()
    {
        var spec = Manifests.Single("HorizontalPodAutoscaler").Root.Map("spec");
        var target = spec.Map("scaleTargetRef");
        Assert.Equal("apps/v1", target.Text("apiVersion"));
        Assert.Equal("Deployment", target.Text("kind"));
        Assert.Equal(Deployment.Name, target.Text("name"));
        var (min, max) = (spec.Integer("minReplicas"), spec.Integer("maxReplicas"));
        Assert.True(min >= 2, $"minReplicas {min}");
        Assert.True(max > min, $"maxReplicas {max} leaves no room above minReplicas {min}");
        var replicas = Deployment.Root.Map("spec").Integer("replicas");
        Assert.InRange(replicas, min, max);
        var metric = Assert.Single(spec.Maps("metrics"));
        Assert.Equal("Resource", metric.Text("type"));
        Assert.Equal("cpu", metric.Map("resource").Text("name"));
        Assert.Equal("Utilization", metric.Map("resource").Map("target").Text("type"));
        Assert.InRange(metric.Map("resource").Map("target").Integer("averageUtilization"), 1, 100);
        // Utilization is a share of the CPU request, so the container must have one.
        Assert.True(Container.Map("resources").Map("requests").Has("cpu"));
        // At least one replica stays up through a drain, and the budget does not block every drain.
        var budget = Manifests.Single("PodDisruptionBudget").Root.Map("spec").Integer("minAvailable");
        Assert.InRange(budget, 1, min - 1);
    }

    [Fact]
    public void ThePortsAgreeFromTheDockerfileToTheServiceAndTheNetworkPolicy()
    {
        var exposed = DockerfileTests.ExposedPort();
        var port = Assert.Single(Container.Maps("ports"));
        Assert.Equal(exposed, port.Integer("containerPort"));
        Assert.Equal("TCP", port.Text("protocol"));

        var servicePort = Assert.Single(Manifests.Single("Service").Root.Map("spec").Maps("ports"));
        Assert.Equal(exposed, ContainerPort(servicePort.Text("targetPort")));

        // Ingress is to the HTTP port alone; egress to PostgreSQL and DNS alone.
        var policy = Manifests.Single("NetworkPolicy").Root.Map("spec");
        Assert.Equal(["Ingress", "Egress"], policy.List("policyTypes").Children.Select(c => ((YamlScalarNode)c).Value));
        var ingress = policy.Maps("ingress").SelectMany(rule => rule.Maps("ports")).ToList();
        Assert.NotEmpty(ingress);
        Assert.All(ingress, p => Assert.Equal(("TCP", exposed), (p.Text("protocol"), ContainerPort(p.Text("port")))));
        var egress = policy.Maps("egress").SelectMany(rule => rule.Maps("ports")).Select(p => $"{p.Text("protocol")}/{p.Text("port")}").Order(StringComparer.Ordinal);
        Assert.Equal(["TCP/53", "TCP/5432", "UDP/53"], egress);
    }

    [Fact]
    public void TheProbesAskRoutesOfTheAppOnTheContainersPort()
    {
        var probes = new Dictionary<string, string> { ["startupProbe"] = "/healthz", ["livenessProbe"] = "/healthz", ["readinessProbe"] = "/readyz" };
        Assert.True(Container.Has("livenessProbe") && Container.Has("readinessProbe"));
        foreach (var (probe, path) in probes.Where(p => Container.Has(p.Key)))
        {
            var get = Container.Map(probe).Map("httpGet");
            Assert.Equal(path, get.Text("path"));
            Assert.True(Routes.HasGet(path), $"{probe}: GET {path} is not a route of openapi/partwise.v1.json");
            Assert.Equal(DockerfileTests.ExposedPort(), ContainerPort(get.Text("port")));
        }
    }

    [Fact]
    public void ThePodRunsAsTheImagesNonRootUserWithAReadOnlyRootAndNoCapabilities()
    {
        var (uid, gid) = DockerfileTests.User();
        var pod = PodSpec.Map("securityContext");
        var container = Container.Map("securityContext");
        foreach (var context in new[] { pod, container })
        {
            Assert.True(context.Flag("runAsNonRoot"));
            Assert.Equal(uid, context.Integer("runAsUser"));
            Assert.Equal(gid, context.Integer("runAsGroup"));
        }

        Assert.True(container.Flag("readOnlyRootFilesystem"));
        Assert.False(container.Flag("allowPrivilegeEscalation"));
        Assert.Equal(["ALL"], container.Map("capabilities").List("drop").Children.Select(c => ((YamlScalarNode)c).Value));
        Assert.False(container.Map("capabilities").Has("add"));
        Assert.False(PodSpec.Flag("automountServiceAccountToken"));

        // The only writable paths are emptyDir volumes, and /tmp is one of them.
        var volumes = PodSpec.Maps("volumes").ToDictionary(v => v.Text("name"), StringComparer.Ordinal);
        var mounts = Container.Maps("volumeMounts").ToList();
        Assert.All(mounts, m => Assert.True(volumes.TryGetValue(m.Text("name"), out var v) && v.Has("emptyDir"), $"{m.Text("mountPath")} is not an emptyDir"));
        Assert.Contains(mounts, m => m.Text("mountPath") == "/tmp");
    }

    [Fact]
    public void TheContainerRequestsAndLimitsCpuAndMemoryWithLimitsAboveRequests()
    {
        var resources = Container.Map("resources");
        foreach (var resource in new[] { "cpu", "memory" })
        {
            var request = Quantity(resources.Map("requests").Text(resource));
            var limit = Quantity(resources.Map("limits").Text(resource));
            Assert.True(request > 0 && limit >= request, $"{resource}: request {request}, limit {limit}");
        }
    }

    [Fact]
    public void EveryReferenceFromThePodNamesAnObjectAndAKeyThatExist()
    {
        var references = 0;
        foreach (var from in Container.Maps("envFrom"))
        {
            var (kind, reference) = from.Has("configMapRef") ? ("ConfigMap", from.Map("configMapRef")) : ("Secret", from.Map("secretRef"));
            Manifests.Named(kind, reference.Text("name"));
            references++;
        }

        foreach (var variable in Container.Maps("env").Where(e => e.Has("valueFrom")))
        {
            var valueFrom = variable.Map("valueFrom");
            var (kind, reference) = valueFrom.Has("configMapKeyRef") ? ("ConfigMap", valueFrom.Map("configMapKeyRef")) : ("Secret", valueFrom.Map("secretKeyRef"));
            var keys = Keys(Manifests.Named(kind, reference.Text("name")));
            Assert.True(keys.ContainsKey(reference.Text("key")), $"{variable.Text("name")}: {kind} {reference.Text("name")} has no key {reference.Text("key")}");
            references++;
        }

        Assert.True(references >= 3, "expected the ConfigMap, the Secret and the PostgreSQL connection string to be referenced");
    }

    [Fact]
    public void ThePodCannotStartWithoutTheSharedPostgresConnectionString()
    {
        // Replicas on SQLite would each keep a store of their own; the connection string is a required key reference.
        var variable = Assert.Single(Container.Maps("env"), e => e.Text("name") == "Partwise__Storage__PostgresConnectionString");
        var reference = variable.Map("valueFrom").Map("secretKeyRef");
        Assert.Equal("Partwise__Storage__PostgresConnectionString", reference.Text("key"));
        Assert.False(reference.Has("optional") && reference.Flag("optional"));
        Assert.False(Keys(Manifests.Single("ConfigMap")).ContainsKey("Partwise__Storage__DataDirectory"));
    }

    [Fact]
    public void TheExampleConnectionStringParsesAndAllReplicasPoolsFitPostgresDefaultConnectionLimit()
    {
        var value = Keys(Manifests.Single("Secret"))["Partwise__Storage__PostgresConnectionString"];
        var connection = new Npgsql.NpgsqlConnectionStringBuilder(value);
        Assert.Equal(5432, connection.Port);
        var maxReplicas = Manifests.Single("HorizontalPodAutoscaler").Root.Map("spec").Integer("maxReplicas");
        // max_connections defaults to 100 (PostgreSQL documentation, "Connections and Authentication").
        Assert.True(maxReplicas * connection.MaxPoolSize <= 100, $"{maxReplicas} replicas x pool {connection.MaxPoolSize} exceed 100 connections");
    }

    [Fact]
    public void TheConfigMapAndTheSecretNameRealSettingsOfTheAppWithValuesItAccepts()
    {
        foreach (var kind in new[] { "ConfigMap", "Secret" })
        {
            var keys = Keys(Manifests.Single(kind));
            Assert.NotEmpty(keys);
            Assert.All(keys.Keys, k => Assert.StartsWith("Partwise__", k, StringComparison.Ordinal));
            Assert.Equal([], AppSettings.Problems(keys));
        }
    }

    [Fact]
    public void TheSecretIsAnExampleWithKeyHashesOnlyAndTheRealOneIsNotCommitted()
    {
        var secret = Manifests.Single("Secret");
        Assert.StartsWith("# EXAMPLE ONLY", Repository.Read("k8s/" + secret.File), StringComparison.Ordinal);
        var keys = Keys(secret);
        var hashes = keys.Where(k => k.Key.EndsWith("__Sha256", StringComparison.Ordinal)).ToList();
        Assert.NotEmpty(hashes);
        Assert.All(hashes, h => Assert.Matches("^[0-9a-f]{64}$", h.Value));
        Assert.Contains("k8s/secret.yaml", Repository.Read(".gitignore").Split('\n'));
    }

    [Fact]
    public void TheAppSettingsCheckRefusesMisspeltAndBadSettings()
    {
        // The check the two tests above rely on, shown to fail where it should.
        Assert.Empty(AppSettings.OptionClassesWithoutSection());
        Assert.NotEmpty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Limits__MaxRow"] = "10" }));
        Assert.NotEmpty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Limits__MaxRows"] = "many" }));
        Assert.NotEmpty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Limits__MaxRows"] = "0" }));
        Assert.NotEmpty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Storage__ChangePollInterval"] = "01:00:00" }));
        Assert.NotEmpty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Nowhere__Setting"] = "1" }));
        Assert.NotEmpty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Credentials__Keys__0__Sha256"] = "not-a-hash" }));
        Assert.Empty(AppSettings.Problems(new Dictionary<string, string> { ["Partwise__Limits__MaxRows"] = "10", ["Partwise__Demo__Enabled"] = "true" }));
    }

    private static IReadOnlyDictionary<string, string> Keys(Manifest manifest)
    {
        var keys = new Dictionary<string, string>(StringComparer.Ordinal);
        foreach (var section in new[] { "data", "stringData" }.Where(manifest.Root.Has))
        {
            foreach (var (key, value) in manifest.Root.Strings(section))
            {
                // Secret data is base64; stringData and ConfigMap data are plain.
                keys[key] = manifest.Kind == "Secret" && section == "data" ? System.Text.Encoding.UTF8.GetString(Convert.FromBase64String(value)) : value;
            }
        }

        return keys;
    }

    private static int ContainerPort(string port)
    {
        if (int.TryParse(port, NumberStyles.None, CultureInfo.InvariantCulture, out var number))
        {
            return number;
        }

        var named = Container.Maps("ports").SingleOrDefault(p => p.Has("name") && p.Text("name") == port)
            ?? throw new Xunit.Sdk.XunitException($"the container has no port named {port}");
        return named.Integer("containerPort");
    }

    // Kubernetes quantities as the manifests use them: millicores (250m), whole units, and binary suffixes.
    private static double Quantity(string text)
    {
        var suffixes = new Dictionary<string, double> { ["m"] = 1e-3, ["Ki"] = 1024, ["Mi"] = 1024 * 1024, ["Gi"] = 1024d * 1024 * 1024 };
        foreach (var (suffix, factor) in suffixes)
        {
            if (text.EndsWith(suffix, StringComparison.Ordinal))
            {
                return double.Parse(text[..^suffix.Length], CultureInfo.InvariantCulture) * factor;
            }
        }

        return double.Parse(text, CultureInfo.InvariantCulture);
    }
}
