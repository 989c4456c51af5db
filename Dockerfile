# veer service image: one image, two commands (API: `npm run api`; worker: `npm run worker`).
# TypeScript runs through tsx (the project's runtime for .ts sources), so there is no build step.
FROM node:20-bookworm-slim

WORKDIR /app
ENV NODE_ENV=production

# better-sqlite3 ships prebuilt binaries for this platform; build tools only as a fallback.
RUN apt-get update -q \
 && apt-get install -y -q --no-install-recommends python3 make g++ \
 && rm -rf /var/lib/apt/lists/*

COPY package.json package-lock.json ./
# Dev dependencies are skipped: tsx is a runtime dependency.
RUN npm ci --omit=dev && npm cache clean --force

COPY propagator ./propagator
COPY planner ./planner
COPY archive ./archive
COPY queue ./queue
COPY api ./api
COPY ccsds ./ccsds
COPY examples ./examples
COPY tsconfig.json ./

RUN mkdir -p /data && chown node:node /data
USER node
ENV DATA_DIR=/data PORT=8080
EXPOSE 8080

CMD ["npm", "run", "api"]
