# Gasline as a container: compiled once in a build stage; the image runs the compiled JavaScript with production
# dependencies only, as an unprivileged user, writes nothing (a read-only root filesystem is fine), and checks its
# own health with Node (no curl in the image).
ARG NODE_IMAGE=node:20-bookworm-slim

FROM ${NODE_IMAGE} AS build
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --ignore-scripts --no-audit --no-fund
COPY tsconfig.json tsconfig.build.json ./
COPY calc ./calc
COPY server ./server
COPY templates ./templates
COPY views ./views
RUN npm run build

FROM ${NODE_IMAGE} AS runtime
ENV NODE_ENV=production \
    HOST=0.0.0.0 \
    PORT=3000
WORKDIR /app
COPY package.json package-lock.json ./
# production dependencies only; no install scripts run, and npm's cache leaves the image
RUN npm ci --omit=dev --ignore-scripts --no-audit --no-fund && npm cache clean --force && rm -rf /root/.npm
COPY --from=build /app/dist ./dist
# the node image's unprivileged user, by number so that Kubernetes can check runAsNonRoot
USER 1000:1000
EXPOSE 3000
HEALTHCHECK --interval=30s --timeout=3s --start-period=10s --retries=3 \
  CMD ["node", "-e", "fetch('http://127.0.0.1:'+(process.env.PORT||3000)+'/healthz').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))"]
# node itself, not npm (npm writes logs under the home folder, which a read-only root does not allow)
CMD ["node", "--max-semi-space-size=64", "dist/server/main.js"]
