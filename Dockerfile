# Partwise in a container: build with the .NET SDK, run on the ASP.NET Core runtime as a non-root user.
#   docker build -t partwise .
#   docker run --rm -p 8080:8080 -v partwise-data:/data partwise
# One container with SQLite in /data is one instance; several replicas need PostgreSQL
# (Partwise__Storage__PostgresConnectionString), see k8s/ and the README's "Deploy" section.
# No engine builds this image in CI: .ci/run replays the build stage (its COPY lines, then its dotnet restore and
# dotnet publish lines as they stand) in a temporary directory and probes the published service, and
# tests/Partwise.Deployment.Tests checks this file against the app and k8s/.

FROM mcr.microsoft.com/dotnet/sdk:10.0 AS build
WORKDIR /src
# The project files first, so the restore layer is reused while only code changes.
COPY global.json Directory.Build.props Directory.Packages.props .editorconfig ./
COPY src/Partwise.Api/Partwise.Api.csproj src/Partwise.Api/
COPY src/Partwise.Core/Partwise.Core.csproj src/Partwise.Core/
COPY src/Partwise.Demo/Partwise.Demo.csproj src/Partwise.Demo/
COPY src/Partwise.Storage/Partwise.Storage.csproj src/Partwise.Storage/
RUN dotnet restore src/Partwise.Api -r linux-x64
COPY src/ src/
# -r linux-x64: only the native SQLite library of this platform lands in the output.
RUN dotnet publish src/Partwise.Api -c Release -r linux-x64 --self-contained false --no-restore -o /app

FROM mcr.microsoft.com/dotnet/aspnet:10.0 AS runtime
# A numeric non-root user (Kubernetes' runAsNonRoot can only verify a numeric USER); k8s/deployment.yaml runs as the same UID.
RUN groupadd --system --gid 10001 partwise \
    && useradd --system --uid 10001 --gid 10001 --no-create-home --home-dir /nonexistent --shell /usr/sbin/nologin partwise \
    && mkdir -p /data \
    && chown 10001:10001 /data
WORKDIR /app
COPY --from=build /app ./
# Listen on every interface of the container (the app's own default is loopback only, see
# src/Partwise.Api/Infrastructure/ListenAddress.cs); ASPNETCORE_HTTP_PORTS is cleared so that the image's
# default does not compete with ASPNETCORE_URLS. /data is the only path the service writes (the SQLite store).
ENV ASPNETCORE_URLS=http://0.0.0.0:8080 \
    ASPNETCORE_HTTP_PORTS= \
    Partwise__Storage__DataDirectory=/data
VOLUME ["/data"]
EXPOSE 8080
USER 10001:10001
# The runtime image has no HTTP client: the app probes itself (src/Partwise.Api/Health/HealthProbe.cs), without
# starting a host or opening the store.
HEALTHCHECK --interval=30s --timeout=5s --start-period=20s --retries=3 \
    CMD ["dotnet", "/app/Partwise.Api.dll", "health-probe", "http://127.0.0.1:8080/healthz"]
ENTRYPOINT ["dotnet", "/app/Partwise.Api.dll"]
