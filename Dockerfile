# OpsLvp server image. Build: docker build -t opslvp .   Run: docker compose up
FROM mcr.microsoft.com/dotnet/sdk:10.0 AS build
WORKDIR /src
COPY . .
RUN dotnet publish src/OpsLvp.Web -c Release -o /app/publish

FROM mcr.microsoft.com/dotnet/aspnet:10.0 AS runtime
WORKDIR /app
COPY --from=build /app/publish .
COPY seed-demo /app/seed-demo
COPY wwwroot-assets /app/wwwroot-assets
ENV ASPNETCORE_URLS=http://+:8080 \
    Storage__DataFolder=/data
VOLUME ["/data"]
EXPOSE 8080
HEALTHCHECK --interval=30s --timeout=5s --start-period=30s --retries=3 \
  CMD ["dotnet", "OpsLvp.Web.dll", "--healthcheck"]
ENTRYPOINT ["dotnet", "OpsLvp.Web.dll"]
