// The benchmark baseline: the same Express 5 on the same runtime, one route answering `{}`.
import express from 'express'

const app = express()
app.get('/', (_req, res) => {
  res.json({})
})
app.listen(Number(process.env.PORT), '127.0.0.1')
